'use client';

import type { ColumnDef } from '@tanstack/react-table';
import { useMemo } from 'react';
import { DataTable } from '@/components/table/data-table';
import { fixed, formatFNumber, formatSignedNm, formatTransmission, MISSING } from '@/components/charts/format';
import type { CurveStudy } from '@/lib/study/types';
import { baseName } from '@/lib/study/verdict';
import { formatCurveId } from '@/lib/labels';

type Row = {
  key: string;
  id: number | null;
  label: string;
  colour: string;
  tau: number;
  collimated: number;
  neq: number | null;
  edge: number | null;
  best: number | null;
  gain: number | null;
  leak: { name: string; tau: number } | null;
  contrast: number | null;
};

const nowrap = (text: string) => <span className="whitespace-nowrap">{text}</span>;

/** Several curves side by side: the verdicts' headline numbers in one sortable table. */
export function ComparisonTable({ studies, colourOf }: { studies: CurveStudy[]; colourOf: (key: string) => string }) {
  const rows = useMemo<Row[]>(
    () =>
      studies.map((st) => {
        const p = st.onAxis.lines[0];
        const leak = st.onAxis.neighbours.reduce<Row['leak']>((m, n) => (!m || n.throughput > m.tau ? { name: baseName(n.id), tau: n.throughput } : m), null);
        return {
          key: st.curve.key,
          id: st.curve.id,
          label: st.curve.label,
          colour: colourOf(st.curve.key),
          tau: p.throughput,
          collimated: p.collimated,
          neq: p.speedEquivalentFNumber,
          edge: st.edge?.throughput ?? null,
          best: st.onAxis.bestPreShift?.nm ?? null,
          gain: st.onAxis.bestPreShift ? st.onAxis.bestPreShift.throughput - p.throughput : null,
          leak,
          contrast: st.onAxis.contrast,
        };
      }),
    [studies, colourOf],
  );
  const columns = useMemo<ColumnDef<Row, unknown>[]>(
    () => [
      {
        id: 'curve',
        header: 'Curve',
        accessorFn: (r) => r.label,
        cell: ({ row: { original: r } }) => (
          <span className="inline-flex items-baseline gap-2">
            <span aria-hidden="true" className="h-2.5 w-2.5 shrink-0 self-center rounded-full" style={{ background: r.colour }} />
            <span>
              {r.id != null ? <span className="figures text-xs text-muted">{formatCurveId(r.id)} </span> : null}
              {r.label}
            </span>
          </span>
        ),
      },
      { id: 'tau', header: 'Line throughput', accessorFn: (r) => r.tau, meta: { numeric: true }, cell: ({ getValue }) => nowrap(formatTransmission(getValue() as number)) },
      { id: 'col', header: 'Collimated', accessorFn: (r) => r.collimated, meta: { numeric: true }, cell: ({ getValue }) => nowrap(formatTransmission(getValue() as number)) },
      { id: 'neq', header: 'Behaves like', accessorFn: (r) => r.neq ?? Infinity, meta: { numeric: true }, cell: ({ row }) => nowrap(row.original.neq === null ? 'f/∞' : formatFNumber(row.original.neq)) },
      { id: 'edge', header: 'Field edge', accessorFn: (r) => r.edge ?? -1, meta: { numeric: true }, cell: ({ row }) => nowrap(row.original.edge === null ? MISSING : formatTransmission(row.original.edge)) },
      {
        id: 'best',
        header: 'Best pre-shift',
        accessorFn: (r) => r.gain ?? -1,
        meta: { numeric: true },
        cell: ({ row: { original: r } }) => nowrap(r.best === null ? MISSING : `${formatSignedNm(r.best)} (+${fixed((r.gain ?? 0) * 100, 1)} pts)`),
      },
      {
        id: 'leak',
        header: 'Worst neighbour',
        accessorFn: (r) => r.leak?.tau ?? -1,
        meta: { numeric: true },
        cell: ({ row: { original: r } }) => nowrap(r.leak ? `${r.leak.name} ${formatTransmission(r.leak.tau)}` : MISSING),
      },
      { id: 'contrast', header: 'Contrast', accessorFn: (r) => r.contrast ?? -1, meta: { numeric: true }, cell: ({ row }) => nowrap(row.original.contrast === null ? MISSING : `${fixed(row.original.contrast, 3)} /nm`) },
    ],
    [],
  );
  return (
    <section aria-labelledby="comparison-heading" className="space-y-2">
      <h2 id="comparison-heading" className="text-sm font-semibold">
        Side by side
      </h2>
      <DataTable data={rows} columns={columns} caption="The chosen curves on this optic, side by side" initialSort={[{ id: 'tau', desc: true }]} />
    </section>
  );
}
