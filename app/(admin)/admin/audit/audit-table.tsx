'use client';

import type { ColumnDef } from '@tanstack/react-table';
import { DataTable } from '@/components/table/data-table';

export type AuditRow = { id: number; at: string; actor: string; action: string; target: string; detail: string };

const columns: ColumnDef<AuditRow, unknown>[] = [
  { accessorKey: 'at', header: 'When (UTC)', cell: ({ getValue }) => String(getValue()).replace('T', ' ').slice(0, 19) },
  { accessorKey: 'actor', header: 'Who' },
  { accessorKey: 'action', header: 'What' },
  { accessorKey: 'target', header: 'On' },
  { accessorKey: 'detail', header: 'Detail', enableSorting: false, cell: ({ getValue }) => <code className="break-all text-xs">{String(getValue())}</code> },
];

export function AuditTable({ rows }: { rows: AuditRow[] }) {
  return <DataTable data={rows} columns={columns} caption="Audit log" pageSize={50} initialSort={[{ id: 'at', desc: true }]} />;
}
