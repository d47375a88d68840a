'use client';

import Link from 'next/link';
import { useMemo, useState } from 'react';
import { useRouter } from 'next/navigation';
import type { ColumnDef } from '@tanstack/react-table';
import { DataTable } from '@/components/table/data-table';
import { findLine } from '@/lib/engine/lines';
import { CheckSummary, type CheckCounts } from './check-list';

export type QueueRow = {
  id: number; label: string; lines: string[]; revision: number; checkLevel: 'info' | 'warn' | 'error'; checkCounts: CheckCounts;
  contributor: string; contributorId: string; fileCount: number; createdAt: string; updatedAt: string; own: boolean;
};

const LEVEL_RANK = { error: 2, warn: 1, info: 0 } as const;

function waited(iso: string, now: number) {
  const hours = Math.max(0, (now - new Date(iso).getTime()) / 3_600_000);
  return hours < 1 ? `${Math.max(1, Math.round(hours * 60))} min` : hours < 48 ? `${Math.floor(hours)} h` : `${Math.floor(hours / 24)} days`;
}

const selectClass = 'rounded-card border border-rule bg-panel px-2 py-1 text-sm';

/** The queue, oldest first; filters run in the browser since the queue is small. */
export function QueueTable({ rows, now }: { rows: QueueRow[]; now: number }) {
  const router = useRouter();
  const [line, setLine] = useState('');
  const [contributor, setContributor] = useState('');
  const [level, setLevel] = useState('');
  const lines = useMemo(() => [...new Set(rows.flatMap((r) => r.lines))].sort(), [rows]);
  const contributors = useMemo(() => [...new Map(rows.map((r) => [r.contributorId, r.contributor])).entries()].sort((a, b) => a[1].localeCompare(b[1])), [rows]);
  const shown = rows.filter((r) => (!line || r.lines.includes(line)) && (!contributor || r.contributorId === contributor) && (!level || r.checkLevel === level));

  const columns: ColumnDef<QueueRow, unknown>[] = [
    // A revision re-enters the queue when it is sent, so the wait counts from the last change.
    { accessorKey: 'updatedAt', header: 'Waiting', cell: ({ getValue }) => <span className="figures whitespace-nowrap" title={String(getValue())}>{waited(String(getValue()), now)}</span> },
    {
      accessorKey: 'label', header: 'Filter',
      cell: ({ row }) => (
        <span>
          <Link href={`/review/${row.original.id}`} className="text-accent underline underline-offset-2">{row.original.label}</Link>
          {row.original.own ? <span className="ml-2 text-xs text-muted">(yours: another moderator reviews it)</span> : null}
        </span>
      ),
    },
    { id: 'lines', accessorFn: (r) => r.lines.map((l) => findLine(l)?.name ?? l).join(', '), header: 'Lines' },
    { accessorKey: 'contributor', header: 'Contributor' },
    { accessorKey: 'fileCount', header: 'Files', meta: { numeric: true } },
    { accessorKey: 'revision', header: 'Revision', meta: { numeric: true } },
    {
      id: 'checks', accessorFn: (r) => LEVEL_RANK[r.checkLevel] * 1000 + r.checkCounts.error * 10 + r.checkCounts.warn, header: 'Checks',
      cell: ({ row }) => <CheckSummary counts={row.original.checkCounts} />,
    },
  ];

  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-end gap-3" role="group" aria-label="Filters">
        <label className="text-sm">
          <span className="block text-xs text-muted">Line</span>
          <select value={line} onChange={(e) => setLine(e.target.value)} className={selectClass} aria-label="Filter by line">
            <option value="">All lines</option>
            {lines.map((l) => <option key={l} value={l}>{findLine(l)?.name ?? l}</option>)}
          </select>
        </label>
        <label className="text-sm">
          <span className="block text-xs text-muted">Contributor</span>
          <select value={contributor} onChange={(e) => setContributor(e.target.value)} className={selectClass} aria-label="Filter by contributor">
            <option value="">Everyone</option>
            {contributors.map(([id, name]) => <option key={id} value={id}>{name}</option>)}
          </select>
        </label>
        <label className="text-sm">
          <span className="block text-xs text-muted">Check level</span>
          <select value={level} onChange={(e) => setLevel(e.target.value)} className={selectClass} aria-label="Filter by check level">
            <option value="">Any</option>
            <option value="error">With problems</option>
            <option value="warn">With warnings</option>
            <option value="info">All checks passed</option>
          </select>
        </label>
        {line || contributor || level ? (
          <button type="button" className="text-sm text-accent underline" onClick={() => { setLine(''); setContributor(''); setLevel(''); }}>Clear filters</button>
        ) : null}
      </div>
      <DataTable data={shown} columns={columns} caption="Submissions waiting for review" pageSize={20} initialSort={[{ id: 'updatedAt', desc: false }]}
        onRowClick={(r) => router.push(`/review/${r.id}`)}
        empty={<p className="rounded-card border border-dashed border-rule p-6 text-sm text-muted">{rows.length ? 'No waiting submission matches these filters.' : 'The queue is empty.'}</p>} />
    </div>
  );
}
