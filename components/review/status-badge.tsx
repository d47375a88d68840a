import type { ReactNode } from 'react';

// Each state has its own glyph as well as its own colour, so the badge reads in grey print,
// for every colour vision and in the all-red night view.
const STATUS: Record<string, { word: string; tone: string; icon: ReactNode }> = {
  verified: {
    word: 'verified',
    tone: 'text-ok border-ok/50 bg-ok/10',
    icon: <path d="M3 8.5 6.5 12 13 4.5" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round" />,
  },
  submitted: {
    word: 'waiting',
    tone: 'text-wait border-wait/50 bg-wait/10',
    icon: (
      <>
        <circle cx="8" cy="8" r="6" fill="none" stroke="currentColor" strokeWidth="1.6" />
        <path d="M8 4.5V8l2.5 1.6" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" />
      </>
    ),
  },
  changes_requested: {
    word: 'changes requested',
    tone: 'text-revise border-revise/50 bg-revise/10',
    icon: <path d="M3 13l1-3.2L11 2.8l2.2 2.2-7 7L3 13zM9.6 4.2l2.2 2.2" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinejoin="round" />,
  },
  rejected: {
    word: 'rejected',
    tone: 'text-bad border-bad/50 bg-bad/10',
    icon: <path d="M4 4l8 8M12 4l-8 8" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />,
  },
  superseded: {
    word: 'superseded',
    tone: 'text-muted border-rule bg-paper',
    icon: <path d="M3 8h9M9 5l3 3-3 3" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round" />,
  },
};

export function statusWord(status: string): string {
  return STATUS[status]?.word ?? status.replace(/_/g, ' ');
}

export function StatusBadge({ status }: { status: string }) {
  const s = STATUS[status] ?? { word: status, tone: 'text-muted border-rule', icon: null };
  return (
    <span data-status={status} className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-medium ${s.tone}`}>
      <svg width="12" height="12" viewBox="0 0 16 16" aria-hidden="true">{s.icon}</svg>
      {s.word}
    </span>
  );
}
