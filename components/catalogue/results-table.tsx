'use client';

import { OddsCell, oddsUrl } from './unit-odds';
import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef } from '@tanstack/react-table';
import { Sparkline } from '@/components/charts/sparkline';
import { formatFNumber, formatNm, formatTransmission } from '@/components/charts/format';
import { StatusBadge } from '@/components/review/status-badge';
import { findLine } from '@/lib/engine/lines';
import { INSTRUMENT_NAMES, lineName } from './labels';
import { useCompareBoard, MAX_COMPARE } from './compare-board';
import type { ResultItem } from './types';
import { UnitSetAngles } from './unit-set';

type SortKey = 'cwl' | 'fwhm' | 'peak' | 'throughput';
type Meta = { numeric?: boolean; sort?: SortKey; className?: string };

function SortHeader({ label, sortKey, sort, dir, onSort }: { label: string; sortKey: SortKey; sort: string; dir: string; onSort: (s: SortKey) => void }) {
  const on = sort === sortKey;
  return (
    <button type="button" onClick={() => onSort(sortKey)} className="inline-flex items-center gap-1 hover:text-accent" data-sort={sortKey}>
      {label}
      <span aria-hidden="true" className={on ? 'text-accent' : 'text-muted'}>
        {on ? (dir === 'asc' ? '▲' : '▼') : '↕'}
      </span>
    </button>
  );
}

export function ResultsTable(props: {
  items: ResultItem[];
  sort: string;
  dir: string;
  fitness: boolean;
  targetLine?: string;
  onSort: (s: SortKey) => void;
  busy: boolean;
  /** The optic of the fitness filter, for the odds column (GET /api/labels/odds). */
  odds?: { fNumber: number; obstruction: number; nEff?: number; fieldAngleDeg?: number; minThroughput: number };
}) {
  const router = useRouter();
  const board = useCompareBoard();
  const { sort, dir, onSort } = props;
  const header = (label: string, key: SortKey) => function SortableHeader() {
    return <SortHeader label={label} sortKey={key} sort={sort} dir={dir} onSort={onSort} />;
  };

  const columns: ColumnDef<ResultItem>[] = [
    {
      id: 'compare',
      header: () => <span className="sr-only">Compare</span>,
      cell: ({ row }) => {
        const id = row.original.id;
        const on = board.ids.includes(id);
        return (
          <input
            type="checkbox"
            aria-label={`Add ${row.original.title} to the compare board`}
            title={on ? 'On the compare board' : board.full ? `The board holds ${MAX_COMPARE} curves` : 'Add to the compare board'}
            checked={on}
            disabled={!on && board.full}
            onChange={() => board.toggle(id)}
            onClick={(e) => e.stopPropagation()}
            data-testid={`compare-${id}`}
            className="h-4 w-4 accent-[rgb(var(--c-accent))]"
          />
        );
      },
      meta: { className: 'w-8' } satisfies Meta,
    },
    {
      id: 'curve',
      header: 'Curve',
      cell: ({ row }) => {
        const r = row.original;
        return (
          <div className="min-w-[14rem] max-w-md space-y-0.5">
            <Link href={`/curves/${r.id}`} className="font-medium text-ink hover:text-accent hover:underline" onClick={(e) => e.stopPropagation()} data-testid="result-link">
              {r.title}
            </Link>
            <div className="text-xs text-muted">
              <span className="text-ink">{r.lines.map(lineName).join(', ')}</span>
              {' · '}
              {[r.maker, INSTRUMENT_NAMES[r.instrument] ?? r.instrument].filter(Boolean).join(' · ')}
              {r.status !== 'verified' ? (
                <span className="ml-2 align-middle">
                  <StatusBadge status={r.status} />
                </span>
              ) : null}
            </div>
            <p className="figures text-xs text-muted sm:hidden">
              {formatNm(r.cwlNm)} CWL at 0° · {formatNm(r.fwhmNm)} FWHM · peak {formatTransmission(r.peakT)}
              {r.throughput !== undefined ? ` · keeps ${formatTransmission(r.throughput)}` : ''}
            </p>
            <UnitSetAngles set={r.set} title={r.title} />
            {r.snippet ? <p className="text-xs leading-snug text-muted [&_mark]:rounded-sm [&_mark]:bg-accent/20 [&_mark]:px-0.5 [&_mark]:text-ink" dangerouslySetInnerHTML={{ __html: r.snippet }} /> : null}
          </div>
        );
      },
    },
    {
      id: 'passband',
      header: 'Passband',
      cell: ({ row }) => {
        const r = row.original;
        const target = props.targetLine ?? r.lines[0];
        return (
          <Sparkline
            wavelengthNm={r.sparkline.wavelengthNm}
            transmission={r.sparkline.transmission}
            lineNm={target ? findLine(target)?.airNm : undefined}
            width={104}
            height={26}
            label={`Passband of curve ${r.id}`}
          />
        );
      },
    },
    {
      id: 'cwl',
      header: header('CWL at 0°', 'cwl'),
      cell: ({ row }) => (
        <span
          data-testid="cwl"
          data-raw={row.original.cwlNm ?? ''}
          title={row.original.aoiDeg > 0 ? `At normal incidence; ${formatNm(row.original.measuredCwlNm)} as measured at ${row.original.aoiDeg}°` : 'At normal incidence, as measured'}
        >
          {formatNm(row.original.cwlNm)}
        </span>
      ),
      meta: { numeric: true } satisfies Meta,
    },
    { id: 'fwhm', header: header('FWHM', 'fwhm'), cell: ({ row }) => <span data-testid="fwhm" data-raw={row.original.fwhmNm ?? ''}>{formatNm(row.original.fwhmNm)}</span>, meta: { numeric: true } satisfies Meta },
    { id: 'peak', header: header('Peak T', 'peak'), cell: ({ row }) => formatTransmission(row.original.peakT), meta: { numeric: true } satisfies Meta },
  ];
  if (props.fitness) {
    columns.push(
      {
        id: 'throughput',
        header: header('Line throughput', 'throughput'),
        cell: ({ row }) => (
          <span>
            <span data-testid="throughput" data-raw={row.original.throughput ?? ''}>
              {formatTransmission(row.original.throughput)}
            </span>
            {row.original.throughputRange ? (
              <span className="block text-xs text-muted" data-testid="throughput-range" title="Within the curve's wavelength-scale uncertainty (declared, else its instrument's default)">
                {formatTransmission(row.original.throughputRange[0], 0)}–{formatTransmission(row.original.throughputRange[1], 0)}
              </span>
            ) : null}
          </span>
        ),
        meta: { numeric: true } satisfies Meta,
      },
      {
        id: 'speed',
        // A whole header: "Like f/…" read as a word cut off.
        header: () => <abbr title="Speed-equivalent f-number: the f-number at which an ideal filter of the same peak would collect the same line signal">Acts like</abbr>,
        cell: ({ row }) => (row.original.speedEquivalentFNumber === null ? '∞' : formatFNumber(row.original.speedEquivalentFNumber)),
        meta: { numeric: true } satisfies Meta,
      },
    );
  }

  if (props.odds) {
    const o = props.odds;
    columns.push({
      id: 'odds',
      header: () => (
        <abbr title={`Units of the same label that keep at least ${Math.round(o.minThroughput * 100)} % of the line on this optic: counted, and from a fitted spread`}>
          Units ≥ {Math.round(o.minThroughput * 100)} %
        </abbr>
      ),
      cell: ({ row }) => {
        const line = props.targetLine ?? row.original.lines[0];
        return line ? <OddsCell url={oddsUrl({ label: row.original.label, line, ...o })} /> : '—';
      },
      meta: { numeric: true } satisfies Meta,
    });
  }
  if (props.items.some((i) => i.skyGain !== undefined)) {
    columns.push({
      id: 'contrast',
      header: () => <abbr title="Background-limited contrast gain over an ideal 10 nm box under the chosen sky">Contrast</abbr>,
      cell: ({ row }) => (
        <span data-testid="sky-gain" data-raw={row.original.skyGain ?? ''}>
          {row.original.skyGain == null ? '—' : `× ${row.original.skyGain.toFixed(2)}`}
        </span>
      ),
      meta: { numeric: true } satisfies Meta,
    });
  }

  const table = useReactTable({ data: props.items, columns, getCoreRowModel: getCoreRowModel(), manualSorting: true, manualPagination: true });

  return (
    <div className={`overflow-auto rounded-card border border-rule transition-opacity ${props.busy ? 'opacity-60' : ''}`} aria-busy={props.busy}>
      <table className="w-full border-collapse text-sm" data-testid="results">
        <caption className="sr-only">Curves matching the search; column headers sort, a row opens its curve</caption>
        <thead className="sticky top-0 z-[1] bg-panel">
          {table.getHeaderGroups().map((hg) => (
            <tr key={hg.id}>
              {hg.headers.map((h) => {
                const meta = h.column.columnDef.meta as Meta | undefined;
                const key = ['cwl', 'fwhm', 'peak', 'throughput'].includes(h.column.id) ? h.column.id : null;
                return (
                  <th
                    key={h.id}
                    scope="col"
                    aria-sort={key && sort === key ? (dir === 'asc' ? 'ascending' : 'descending') : undefined}
                    className={`whitespace-nowrap border-b border-rule px-3 py-2 font-medium ${meta?.numeric ? 'text-right' : 'text-left'} ${meta?.className ?? ''}`}
                  >
                    {flexRender(h.column.columnDef.header, h.getContext())}
                  </th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {table.getRowModel().rows.map((row) => (
            <tr
              key={row.id}
              onClick={() => router.push(`/curves/${row.original.id}`)}
              className="cursor-pointer border-b border-rule/60 hover:bg-accent/5"
              data-curve-id={row.original.id}
            >
              {row.getVisibleCells().map((cell) => {
                const meta = cell.column.columnDef.meta as Meta | undefined;
                return (
                  <td key={cell.id} className={`px-3 py-2 align-top ${meta?.numeric ? 'figures whitespace-nowrap text-right' : ''} ${meta?.className ?? ''}`}>
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
