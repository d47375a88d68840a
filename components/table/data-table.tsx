'use client';

import { useState } from 'react';
import {
  flexRender, getCoreRowModel, getPaginationRowModel, getSortedRowModel, useReactTable,
  type ColumnDef, type SortingState,
} from '@tanstack/react-table';

// Sortable headers, right-aligned numbers, sticky header, pages with the total.
export function DataTable<T>(props: {
  data: T[];
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  columns: ColumnDef<T, any>[];
  pageSize?: number;
  initialSort?: SortingState;
  caption: string;
  onRowClick?: (row: T) => void;
  empty?: React.ReactNode;
}) {
  const [sorting, setSorting] = useState<SortingState>(props.initialSort ?? []);
  const table = useReactTable({
    data: props.data,
    columns: props.columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
    initialState: { pagination: { pageSize: props.pageSize ?? 25 } },
  });
  const { pageIndex, pageSize } = table.getState().pagination;
  const total = props.data.length;
  if (total === 0 && props.empty) return <>{props.empty}</>;
  return (
    <div className="space-y-2">
      <div className="max-h-[70vh] overflow-auto rounded-card border border-rule">
        <table className="w-full border-collapse text-sm">
          <caption className="sr-only">{props.caption}</caption>
          <thead className="sticky top-0 bg-panel">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const sorted = h.column.getIsSorted();
                  const numeric = (h.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                  return (
                    <th key={h.id} scope="col" aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : 'none'}
                      className={`border-b border-rule px-3 py-2 font-medium ${numeric ? 'text-right' : 'text-left'}`}>
                      {h.column.getCanSort() ? (
                        <button type="button" onClick={h.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 hover:text-accent">
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          <span aria-hidden="true" className="text-muted">{sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}</span>
                        </button>
                      ) : (
                        flexRender(h.column.columnDef.header, h.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} onClick={props.onRowClick ? () => props.onRowClick!(row.original) : undefined}
                className={`border-b border-rule/60 ${props.onRowClick ? 'cursor-pointer hover:bg-accent/5' : ''}`}>
                {row.getVisibleCells().map((cell) => {
                  const numeric = (cell.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                  return (
                    <td key={cell.id} className={`px-3 py-2 align-top ${numeric ? 'figures text-right' : ''}`}>
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div className="flex flex-wrap items-center gap-3 text-sm">
        <span className="text-muted">
          {total === 0 ? 'No rows' : `Rows ${pageIndex * pageSize + 1}–${Math.min(total, (pageIndex + 1) * pageSize)} of ${total}`}
        </span>
        <button type="button" className="rounded-card border border-rule px-2 py-1 disabled:opacity-40" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()}>Previous</button>
        <button type="button" className="rounded-card border border-rule px-2 py-1 disabled:opacity-40" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()}>Next</button>
      </div>
    </div>
  );
}
