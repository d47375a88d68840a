'use client';

import Link from 'next/link';
import { useMemo, useState } from 'react';
import useSWR from 'swr';
import type { ColumnDef } from '@tanstack/react-table';
import { DataTable } from '@/components/table/data-table';
import { fixed, formatDeg, formatFNumber, formatRatio, MISSING } from '@/components/charts/format';
import type { OpticView } from '@/lib/optics/store';
import { api } from '@/lib/api-client';
import { OpticForm, valuesOf, type OpticFormValues } from './optic-form';

const fetcher = api.optics.list;

const mm = (v: number | null) => (v == null ? MISSING : `${fixed(v, v < 100 ? 1 : 0)} mm`);
const action = 'rounded-card border border-rule px-2 py-0.5 text-xs hover:border-accent hover:text-accent';

export function OpticsManager({ initial, signedIn }: { initial: OpticView[]; signedIn: boolean }) {
  const { data, mutate } = useSWR<{ items: OpticView[] }>(api.optics.listUrl, fetcher, { fallbackData: { items: initial }, revalidateOnFocus: false });
  const items = data?.items ?? initial;
  const [editing, setEditing] = useState<OpticView | null>(null);
  const [start, setStart] = useState<OpticFormValues | null>(null);
  const [confirming, setConfirming] = useState<number | null>(null);
  const [message, setMessage] = useState<{ tone: 'ok' | 'bad'; text: string } | null>(null);

  async function remove(o: OpticView) {
    const res = await api.optics.remove(o.id);
    setConfirming(null);
    if (res.ok) {
      if (editing?.id === o.id) {
        setEditing(null);
        setStart(null);
      }
      // Gone from the list at once; the refetch confirms it.
      await mutate({ items: items.filter((x) => x.id !== o.id) }, { revalidate: true });
      setMessage({ tone: 'ok', text: `Deleted “${o.name}”.` });
    } else {
      setMessage({ tone: 'bad', text: res.failure.error });
    }
  }

  const actionsFor = (o: OpticView, align: 'start' | 'end' = 'end') => (
    <div className={`flex flex-wrap gap-1.5 ${align === 'end' ? 'justify-end' : ''}`}>
      <Link href={`/study?optic=${o.id}`} className={action}>
        Study
      </Link>
      {o.mine ? (
        <>
          <button
            type="button"
            className={action}
            onClick={() => {
              setEditing(o);
              setStart(valuesOf(o));
              setMessage(null);
            }}
          >
            Edit
          </button>
          {confirming === o.id ? (
            <span className="inline-flex items-center gap-1">
              <button type="button" className="rounded-card bg-bad px-2 py-0.5 text-xs text-paper" onClick={() => remove(o)}>
                Delete “{o.name.slice(0, 18)}{o.name.length > 18 ? '…' : ''}”
              </button>
              <button type="button" className={action} onClick={() => setConfirming(null)}>
                Keep
              </button>
            </span>
          ) : (
            <button type="button" className={`${action} hover:!border-bad hover:!text-bad`} onClick={() => setConfirming(o.id)}>
              Delete
            </button>
          )}
        </>
      ) : signedIn ? (
        <button
          type="button"
          className={action}
          onClick={() => {
            setEditing(null);
            setStart(valuesOf(o, true));
            setMessage(null);
          }}
        >
          Copy
        </button>
      ) : null}
    </div>
  );

  const columns = useMemo<ColumnDef<OpticView, unknown>[]>(
    () => [
      {
        id: 'name',
        header: 'Optic',
        accessorFn: (o) => o.name,
        cell: ({ row: { original: o } }) => (
          <div className="min-w-[12rem] max-w-md">
            <span className="font-medium">{o.name}</span>{' '}
            {o.isExample ? <span className="rounded-card border border-rule px-1 text-[10px] uppercase tracking-wider text-muted">example</span> : null}
            {o.description ? <p className="mt-0.5 text-xs leading-snug text-muted">{o.description}</p> : null}
          </div>
        ),
      },
      { id: 'f', header: 'f-number', accessorFn: (o) => o.fNumber, meta: { numeric: true }, cell: ({ getValue }) => formatFNumber(getValue() as number) },
      { id: 'obs', header: 'Obstruction', accessorFn: (o) => o.obstruction, meta: { numeric: true }, cell: ({ getValue }) => formatRatio(getValue() as number) },
      { id: 'field', header: 'Field edge', accessorFn: (o) => o.fieldAngleDeg, meta: { numeric: true }, cell: ({ getValue }) => formatDeg(getValue() as number) },
      { id: 'aperture', header: 'Aperture', accessorFn: (o) => o.apertureMm ?? -1, meta: { numeric: true }, cell: ({ row }) => mm(row.original.apertureMm) },
      {
        id: 'focal',
        header: 'Focal length',
        accessorFn: (o) => o.focalLengthMm ?? -1,
        meta: { numeric: true },
        cell: ({ row: { original: o } }) => (
          <span className="whitespace-nowrap">
            {mm(o.focalLengthMm)}
            {o.reducerFactor != null ? <span className="text-muted"> × {o.reducerFactor}</span> : null}
          </span>
        ),
      },
      {
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        enableSorting: false,
        cell: ({ row: { original: o } }) => actionsFor(o),
      },
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [confirming, editing, signedIn],
  );

  const mineCount = items.filter((o) => o.mine).length;

  return (
    <div className="grid grid-cols-[minmax(0,1fr)] items-start gap-8 lg:grid-cols-[minmax(0,1fr)_24rem]">
      <section aria-labelledby="optics-list" className="min-w-0 space-y-3">
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <h2 id="optics-list" className="text-lg font-semibold">
            {signedIn ? `Your optics (${mineCount}) and examples` : 'Example optics'}
          </h2>
          {message ? (
            <p role="status" className={`text-sm ${message.tone === 'ok' ? 'text-ok' : 'text-bad'}`}>
              {message.text}
            </p>
          ) : null}
        </div>
        <div className="hidden md:block">
          <DataTable data={items} columns={columns} caption="Optics" pageSize={15} initialSort={[]} />
        </div>
        {/* On a phone each optic is a card: six numeric columns do not fit 390 px. */}
        <ul className="space-y-2 md:hidden" aria-label="Optics">
          {items.map((o) => (
            <li key={o.id} className="rounded-card border border-rule bg-panel p-3">
              <p className="font-medium leading-snug">
                {o.name}{' '}
                {o.isExample ? <span className="rounded-card border border-rule px-1 text-[10px] uppercase tracking-wider text-muted">example</span> : null}
              </p>
              <p className="figures mt-1 text-sm">
                {formatFNumber(o.fNumber)} · obstruction {formatRatio(o.obstruction)} · edge {formatDeg(o.fieldAngleDeg)}
              </p>
              {o.apertureMm != null || o.focalLengthMm != null ? (
                <p className="figures text-xs text-muted">
                  {mm(o.apertureMm)} aperture · {mm(o.focalLengthMm)}
                  {o.reducerFactor != null ? ` × ${o.reducerFactor}` : ''} focal length
                </p>
              ) : null}
              {o.description ? <p className="mt-1 text-xs leading-snug text-muted">{o.description}</p> : null}
              <div className="mt-2">{actionsFor(o, 'start')}</div>
            </li>
          ))}
        </ul>
      </section>

      <section aria-labelledby="optic-form-heading" className="space-y-3 rounded-card border border-rule bg-panel p-4 lg:sticky lg:top-4">
        <h2 id="optic-form-heading" className="text-lg font-semibold">
          {editing ? `Edit “${editing.name}”` : 'Save an optic'}
        </h2>
        {signedIn ? (
          <OpticForm
            editing={editing}
            start={start}
            onSaved={async (o) => {
              const text = editing ? `Saved changes to “${o.name}”.` : `Saved “${o.name}”.`;
              setEditing(null);
              setStart(null);
              await mutate({ items: editing ? items.map((x) => (x.id === o.id ? o : x)) : [o, ...items] }, { revalidate: true });
              setMessage({ tone: 'ok', text });
            }}
            onCancel={() => {
              setEditing(null);
              setStart(null);
            }}
          />
        ) : (
          <div className="space-y-3 text-sm">
            <p className="text-muted">
              Sign in to save your own optics: aperture, focal length, reducer, central obstruction and the chief-ray angle at the edge of your sensor. Anyone can
              run a cone study with the examples or with numbers typed on the study page.
            </p>
            <Link href="/signin?callbackUrl=%2Foptics" className="inline-block rounded-card bg-accent px-4 py-2 text-accent-ink">
              Sign in
            </Link>
          </div>
        )}
      </section>
    </div>
  );
}
