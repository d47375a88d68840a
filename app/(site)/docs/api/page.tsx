import type { Metadata } from 'next';
import Link from 'next/link';
import { openApiDocument } from '@/lib/openapi/document';
import { readDocument, type FieldRow, type ReadOperation } from '@/lib/openapi/reading';

export const metadata: Metadata = { title: 'API reference' };

// Drawn per request like every page: its scripts need the request's CSP nonce (proxy.ts).
// The document itself is built once per process (lib/openapi/document.ts).

const METHOD_STYLE: Record<string, string> = {
  get: 'border-ok text-ok',
  post: 'border-accent text-accent',
  patch: 'border-wait text-wait',
  delete: 'border-bad text-bad',
};

/** `code` spans in the registry's plain text, shown as code. */
function Text({ text }: { text: string }) {
  return (
    <>
      {text.split('`').map((part, i) => (i % 2 ? <code key={i} className="figures text-[0.9em]">{part}</code> : <span key={i}>{part}</span>))}
    </>
  );
}

function Fields({ rows, caption }: { rows: (FieldRow & { in?: string; example?: string })[]; caption: string }) {
  if (!rows.length) return null;
  const showIn = rows.some((r) => r.in);
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[20rem] border-collapse text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr className="border-b border-rule text-left text-xs uppercase tracking-wider text-muted">
            <th scope="col" className="py-1 pr-3 font-semibold">Field</th>
            {showIn ? <th scope="col" className="py-1 pr-3 font-semibold">In</th> : null}
            <th scope="col" className="py-1 pr-3 font-semibold">Type</th>
            <th scope="col" className="py-1 font-semibold">Limits and notes</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={(r.in ?? '') + r.name} className="border-b border-rule/50 align-top last:border-b-0">
              <td className="figures break-all py-1 pr-3">
                {r.name}
                {r.required ? <span className="text-accent" title="required"> *</span> : null}
              </td>
              {showIn ? <td className="py-1 pr-3 text-muted">{r.in}</td> : null}
              <td className="figures break-words py-1 pr-3 text-muted">{r.type}</td>
              <td className="break-words py-1">
                <Text text={r.notes} />
                {r.example !== undefined ? <span className="text-muted"> (example: <code className="figures">{r.example}</code>)</span> : null}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function exampleLine(op: ReadOperation): string {
  let path = op.path;
  const query = new URLSearchParams();
  for (const p of op.parameters) {
    if (p.example === undefined) continue;
    if (p.in === 'path') path = path.replace(`{${p.name}}`, encodeURIComponent(p.example));
    if (p.in === 'query') query.set(p.name, p.example);
  }
  const qs = query.toString();
  return `${op.method.toUpperCase()} ${path}${qs ? `?${qs}` : ''}`;
}

function Operation({ op }: { op: ReadOperation }) {
  return (
    <section id={op.anchor} aria-labelledby={`${op.anchor}-title`} className="scroll-mt-20 space-y-3 rounded-card border border-rule bg-panel p-4">
      <h3 id={`${op.anchor}-title`} className="flex flex-wrap items-baseline gap-2">
        <span className={`figures rounded border px-1.5 text-xs font-semibold uppercase ${METHOD_STYLE[op.method] ?? 'border-rule'}`}>{op.method}</span>
        <code className="figures break-all text-base font-semibold">{op.path}</code>
      </h3>
      <p className="font-medium">{op.summary}</p>
      {op.description.split('\n\n').map((para, i) => (
        <p key={i} className="text-sm leading-relaxed text-muted"><Text text={para} /></p>
      ))}
      <Fields rows={op.parameters} caption={`Parameters of ${op.method.toUpperCase()} ${op.path}`} />
      {op.body ? (
        <div className="space-y-2">
          <h4 className="text-xs font-semibold uppercase tracking-wider text-muted">
            Body <span className="figures normal-case tracking-normal">{op.body.type}</span>
          </h4>
          {op.body.description ? <p className="text-sm text-muted"><Text text={op.body.description} /></p> : null}
          <Fields rows={op.body.fields} caption={`Body of ${op.method.toUpperCase()} ${op.path}`} />
        </div>
      ) : null}
      {op.hasExample ? (
        <div className="space-y-1">
          <h4 className="text-xs font-semibold uppercase tracking-wider text-muted">Example request</h4>
          <pre className="figures overflow-x-auto rounded border border-rule bg-paper p-2 text-xs leading-snug">
            {exampleLine(op)}
            {op.body?.example ? `\n${op.body.example}` : ''}
          </pre>
        </div>
      ) : null}
      <div className="space-y-2">
        <h4 className="text-xs font-semibold uppercase tracking-wider text-muted">Answers</h4>
        <ul className="space-y-1 text-sm">
          {op.responses.map((r) => (
            <li key={r.status} className="flex gap-2">
              <span className={`figures shrink-0 font-semibold ${r.status.startsWith('2') || r.status.startsWith('3') ? 'text-ok' : 'text-bad'}`}>{r.status}</span>
              <span className="min-w-0 break-words">
                <Text text={r.description} />
                {r.type && r.type !== 'application/json' ? <span className="figures text-muted"> ({r.type})</span> : null}
              </span>
            </li>
          ))}
        </ul>
        {op.responses.filter((r) => r.fields.length).map((r) => (
          <Fields key={r.status} rows={r.fields} caption={`Fields of the ${r.status} answer`} />
        ))}
      </div>
    </section>
  );
}

export default function ApiReferencePage() {
  const doc = openApiDocument();
  const tags = readDocument(doc);
  return (
    <div className="space-y-8">
      <header className="max-w-3xl space-y-2">
        <p className="text-xs font-semibold uppercase tracking-wider text-accent">API reference</p>
        <h1 className="text-2xl font-semibold tracking-tight sm:text-3xl">Every route, its fields and its answers</h1>
        <p className="leading-relaxed text-muted">
          JSON in and out unless said; wavelengths in nm (standard air), transmission as a fraction 0–1, angles in degrees. A refusal is always{' '}
          <code className="figures">{'{ "error": "…", "details": [ … ] }'}</code> with a 4xx status that says why. Scripts send{' '}
          <code className="figures">Authorization: Bearer …</code> with a token from <Link href="/account/tokens" className="text-accent underline-offset-4 hover:underline">your API tokens</Link>.
          The same description, machine-readable: <a href="/api/openapi.json" className="figures text-accent underline-offset-4 hover:underline">/api/openapi.json</a> (OpenAPI {doc.openapi}).
        </p>
      </header>
      <nav aria-label="Routes" className="rounded-card border border-rule bg-panel p-4">
        <ul className="grid gap-x-6 gap-y-3 sm:grid-cols-2 lg:grid-cols-3">
          {tags.map((t) => (
            <li key={t.name}>
              <p className="text-xs font-semibold uppercase tracking-wider text-muted">{t.name}</p>
              <ul className="mt-1 space-y-0.5 text-sm">
                {t.operations.map((op) => (
                  <li key={op.anchor}>
                    <a href={`#${op.anchor}`} className="figures break-all hover:text-accent">
                      <span className="uppercase text-muted">{op.method}</span> {op.path}
                    </a>
                  </li>
                ))}
              </ul>
            </li>
          ))}
        </ul>
      </nav>
      {tags.map((t) => (
        <section key={t.name} aria-labelledby={`tag-${t.name}`} className="space-y-4">
          <h2 id={`tag-${t.name}`} className="text-xl font-semibold">{t.name}</h2>
          {t.operations.map((op) => (
            <Operation key={op.anchor} op={op} />
          ))}
        </section>
      ))}
    </div>
  );
}
