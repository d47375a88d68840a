'use client';

import Link from 'next/link';
import { useRouter } from 'next/navigation';
import type { ColumnDef } from '@tanstack/react-table';
import { DataTable } from '@/components/table/data-table';
import { StatusBadge } from '@/components/review/status-badge';
import { CheckSummary, type CheckCounts } from '@/components/review/check-list';
import { findLine } from '@/lib/engine/lines';

export type MySubmissionRow = { id: number; label: string; lines: string[]; status: string; revision: number; checkCounts: CheckCounts; fileCount: number; createdAt: string; updatedAt: string };

// Needs attention first: a request for changes is the contributor's move.
const STATUS_ORDER: Record<string, number> = { changes_requested: 0, submitted: 1, rejected: 2, verified: 3 };

const columns: ColumnDef<MySubmissionRow, unknown>[] = [
  {
    accessorKey: 'label', header: 'Filter',
    cell: ({ row }) => <Link href={`/account/submissions/${row.original.id}`} className="text-accent underline underline-offset-2">{row.original.label}</Link>,
  },
  { id: 'lines', accessorFn: (r) => r.lines.map((l) => findLine(l)?.name ?? l).join(', '), header: 'Lines' },
  {
    id: 'status', accessorFn: (r) => STATUS_ORDER[r.status] ?? 9, header: 'Status',
    cell: ({ row }) => <StatusBadge status={row.original.status} />,
  },
  {
    id: 'checks', accessorFn: (r) => r.checkCounts.error * 100 + r.checkCounts.warn, header: 'Checks',
    cell: ({ row }) => <CheckSummary counts={row.original.checkCounts} />,
  },
  { accessorKey: 'fileCount', header: 'Files', meta: { numeric: true } },
  { accessorKey: 'revision', header: 'Revision', meta: { numeric: true } },
  { accessorKey: 'createdAt', header: 'Sent', meta: { numeric: true }, cell: ({ getValue }) => String(getValue()).slice(0, 10) },
  { accessorKey: 'updatedAt', header: 'Last change', meta: { numeric: true }, cell: ({ getValue }) => String(getValue()).slice(0, 10) },
];

export function MySubmissionsTable({ rows }: { rows: MySubmissionRow[] }) {
  const router = useRouter();
  return (
    <DataTable data={rows} columns={columns} caption="My submissions" pageSize={15} initialSort={[{ id: 'status', desc: false }]}
      onRowClick={(r) => router.push(`/account/submissions/${r.id}`)}
      empty={<p className="rounded-card border border-dashed border-rule p-6 text-sm text-muted">Nothing sent yet. <Link href="/submit" className="text-accent underline">Submit a measured curve</Link>.</p>} />
  );
}
