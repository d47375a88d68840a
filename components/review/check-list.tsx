import type { ReactNode } from 'react';

export type CheckItem = { code: string; level: 'info' | 'warn' | 'error'; message: string; file?: string };
export type CheckCounts = { info: number; warn: number; error: number };

// Glyph plus word, never colour alone: "i", "!" and "×" stay apart in the night view.
const LEVEL: Record<CheckItem['level'], { word: string; tone: string; glyph: ReactNode }> = {
  info: { word: 'ok', tone: 'text-ok', glyph: <path d="M3 8.5 6.5 12 13 4.5" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" /> },
  warn: {
    word: 'warning',
    tone: 'text-wait',
    glyph: (
      <>
        <path d="M8 1.8 15 14H1z" fill="none" stroke="currentColor" strokeWidth="1.4" strokeLinejoin="round" />
        <path d="M8 6v4" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" />
        <circle cx="8" cy="12" r="0.9" fill="currentColor" />
      </>
    ),
  },
  error: {
    word: 'problem',
    tone: 'text-bad',
    glyph: (
      <>
        <circle cx="8" cy="8" r="6.5" fill="none" stroke="currentColor" strokeWidth="1.4" />
        <path d="M5.5 5.5l5 5M10.5 5.5l-5 5" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" />
      </>
    ),
  },
};

export function LevelIcon({ level }: { level: CheckItem['level'] }) {
  return (
    <svg width="14" height="14" viewBox="0 0 16 16" aria-hidden="true" className={`shrink-0 ${LEVEL[level].tone}`}>
      {LEVEL[level].glyph}
    </svg>
  );
}

export function levelWord(level: CheckItem['level']) {
  return LEVEL[level].word;
}

export function countChecks(checks: CheckItem[]): CheckCounts {
  return {
    info: checks.filter((c) => c.level === 'info').length,
    warn: checks.filter((c) => c.level === 'warn').length,
    error: checks.filter((c) => c.level === 'error').length,
  };
}

/** "2 problems · 1 warning · 5 ok", the worst first, for tables and headers. */
export function CheckSummary({ counts }: { counts: CheckCounts }) {
  const parts: { level: CheckItem['level']; n: number; text: string }[] = [
    { level: 'error', n: counts.error, text: counts.error === 1 ? 'problem' : 'problems' },
    { level: 'warn', n: counts.warn, text: counts.warn === 1 ? 'warning' : 'warnings' },
    { level: 'info', n: counts.info, text: 'ok' },
  ];
  return (
    <span className="inline-flex flex-wrap items-center gap-x-2 gap-y-0.5 text-xs">
      {parts.filter((p) => p.n > 0).map((p) => (
        <span key={p.level} className="inline-flex items-center gap-1 whitespace-nowrap" data-level={p.level}>
          <LevelIcon level={p.level} />
          <span className="figures">{p.n}</span> {p.text}
        </span>
      ))}
    </span>
  );
}

export function CheckList({ checks, caption }: { checks: CheckItem[]; caption?: string }) {
  if (checks.length === 0) return <p className="text-sm text-muted">No automatic checks yet.</p>;
  const order = { error: 0, warn: 1, info: 2 } as const;
  const sorted = [...checks].sort((a, b) => order[a.level] - order[b.level]);
  return (
    <ul className="space-y-1.5 text-sm" aria-label={caption ?? 'Automatic checks'}>
      {sorted.map((c, i) => (
        <li key={`${c.code}-${c.file ?? ''}-${i}`} className="flex gap-2" data-check={c.code} data-level={c.level}>
          <span className="mt-0.5"><LevelIcon level={c.level} /></span>
          <span>
            <span className="sr-only">{levelWord(c.level)}: </span>
            {c.file ? <span className="figures mr-1 rounded bg-paper px-1 text-xs text-muted">{c.file}</span> : null}
            {c.message}
          </span>
        </li>
      ))}
    </ul>
  );
}
