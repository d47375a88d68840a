'use client';

import { useState } from 'react';
import type { ColumnDef } from '@tanstack/react-table';
import { DataTable } from '@/components/table/data-table';
import { Field, buttonClass, inputClass } from '@/components/forms/field';
import { api, type Json } from '@/lib/api-client';
import type { ApiTokenRow } from '@/lib/account/api-tokens';
import { curlExample, METADATA_EXAMPLE } from './curl-example';

export type TokenRow = Json<ApiTokenRow>;

function stamp(iso: string | null) {
  return iso ? `${iso.slice(0, 10)} ${iso.slice(11, 16)}` : 'never';
}

function CopyButton({ text, label }: { text: string; label: string }) {
  const [done, setDone] = useState(false);
  return (
    <button type="button" className="rounded-card border border-rule px-2 py-1 text-xs hover:border-accent"
      onClick={async () => {
        try {
          await navigator.clipboard.writeText(text);
          setDone(true);
          setTimeout(() => setDone(false), 2000);
        } catch {
          setDone(false);
        }
      }}>
      {done ? 'Copied' : label}
    </button>
  );
}

export function TokensPanel({ initial }: { initial: TokenRow[] }) {
  const [rows, setRows] = useState(initial);
  const [name, setName] = useState('');
  const [error, setError] = useState<string>();
  const [created, setCreated] = useState<{ id: number; name: string; token: string }>();
  const [message, setMessage] = useState<string>();
  // The token box only appears after a click, never in the server render, so reading the origin here is safe.
  const origin = typeof window === 'undefined' ? '' : window.location.origin;

  async function refresh() {
    const res = await api.tokens.list();
    if (res.ok) setRows(res.data.items);
  }

  async function create(e: React.FormEvent) {
    e.preventDefault();
    setError(undefined);
    setMessage(undefined);
    const res = await api.tokens.create({ name });
    if (!res.ok) return setError(res.failure.details?.[0]?.message ?? res.failure.error);
    setCreated(res.data);
    setName('');
    await refresh();
  }

  async function revoke(row: TokenRow) {
    if (!window.confirm(`Revoke "${row.name}"? Scripts using it stop working at once.`)) return;
    const res = await api.tokens.revoke(row.id);
    if (!res.ok) return setMessage(res.failure.error);
    setMessage(`"${row.name}" is revoked.`);
    if (created?.id === row.id) setCreated(undefined);
    await refresh();
  }

  const columns: ColumnDef<TokenRow, unknown>[] = [
    { accessorKey: 'name', header: 'Name' },
    { accessorKey: 'prefix', header: 'Starts with', cell: ({ getValue }) => <span className="figures">{String(getValue())}…</span> },
    { accessorKey: 'createdAt', header: 'Created', meta: { numeric: true }, cell: ({ getValue }) => stamp(getValue() as string) },
    { accessorKey: 'lastUsedAt', header: 'Last used', meta: { numeric: true }, cell: ({ getValue }) => stamp(getValue() as string | null) },
    {
      id: 'state', accessorFn: (r) => (r.revokedAt ? 1 : 0), header: 'State',
      cell: ({ row }) => (row.original.revokedAt ? (
        <span className="text-muted">✕ revoked {stamp(row.original.revokedAt)}</span>
      ) : (
        <span className="inline-flex items-center gap-2">
          <span className="text-ok">● active</span>
          <button type="button" onClick={() => revoke(row.original)} className="rounded-card border border-rule px-2 py-0.5 text-xs hover:border-bad hover:text-bad">
            Revoke<span className="sr-only"> {row.original.name}</span>
          </button>
        </span>
      )),
    },
  ];

  return (
    <div className="space-y-8">
      <form onSubmit={create} className="max-w-xl space-y-3 rounded-card border border-rule bg-panel p-4" noValidate>
        <h2 className="font-semibold">New token</h2>
        <Field id="token-name" label="Name" required error={error} help="Name it after where it will live, e.g. “bench PC, spectrophotometer room”. A token can submit and read your submissions; it cannot make more tokens.">
          <input id="token-name" value={name} onChange={(e) => setName(e.target.value)} maxLength={100} aria-invalid={!!error} className={inputClass} autoComplete="off" />
        </Field>
        <button type="submit" className={buttonClass}>Create token</button>
      </form>

      {created ? (
        <section aria-labelledby="new-token" className="space-y-3 rounded-card border border-accent/60 bg-accent/5 p-4" data-testid="new-token">
          <h2 id="new-token" className="font-semibold">Token “{created.name}” — copy it now</h2>
          <p className="text-sm">It is shown only this once; we keep only a hash of it. If it is lost, revoke it and make another.</p>
          <div className="flex flex-wrap items-center gap-2">
            <code className="figures break-all rounded bg-paper px-2 py-1 text-sm" data-testid="token-secret">{created.token}</code>
            <CopyButton text={created.token} label="Copy token" />
          </div>
          <div className="space-y-1">
            <div className="flex items-center gap-2">
              <h3 className="text-sm font-medium">Upload from a bench script</h3>
              <CopyButton text={curlExample(origin, created.token)} label="Copy command" />
            </div>
            <pre className="figures overflow-x-auto rounded bg-paper p-3 text-xs" data-testid="curl-example">{curlExample(origin, created.token)}</pre>
            <p className="text-xs text-muted">with metadata.json beside the files, for example:</p>
            <pre className="figures overflow-x-auto rounded bg-paper p-3 text-xs">{METADATA_EXAMPLE}</pre>
          </div>
        </section>
      ) : null}

      <section aria-labelledby="tokens-heading" className="space-y-2">
        <h2 id="tokens-heading" className="text-lg font-semibold">Your tokens</h2>
        {message ? <p role="status" className="text-sm">{message}</p> : null}
        <DataTable data={rows} columns={columns} caption="API tokens" pageSize={10}
          empty={<p className="text-sm text-muted">No tokens yet.</p>} />
      </section>
    </div>
  );
}
