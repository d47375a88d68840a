/**
 * CSV built in the browser from what a chart shows. Kept free of React and of the
 * DOM (except `downloadText`) so it can be tested and reused by tables.
 */

import { csvRows, type CsvCell } from '@/lib/csv/safe';

export type { CsvCell };

export interface CsvColumn {
  header: string;
  values: readonly CsvCell[];
}

export interface CsvSeries {
  name: string;
  x: readonly number[];
  y: readonly number[];
}

/**
 * Numbers print at 12 significant digits so float noise (87.40000000000001) does not
 * reach the file, while every digit an instrument can resolve survives. Text cells
 * (labels typed by contributors) follow the one formula-safe rule of lib/csv/safe.ts.
 */
export function rowsToCsv(rows: readonly (readonly CsvCell[])[]): string {
  return csvRows(rows, { digits: 12 });
}

/** Columns may differ in length (curves sampled differently); short ones end in blanks. */
export function columnsToCsv(columns: readonly CsvColumn[]): string {
  const length = columns.reduce((m, c) => Math.max(m, c.values.length), 0);
  const rows: CsvCell[][] = [columns.map((c) => c.header)];
  for (let i = 0; i < length; i++) rows.push(columns.map((c) => c.values[i]));
  return rowsToCsv(rows);
}

function sameGrid(a: readonly number[], b: readonly number[]): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/**
 * Series as columns. Series sampled on the same x grid share one x column (a curve and
 * its cone-averaged twin usually do); series on different grids each keep their own, so
 * no value is ever interpolated. With one grid the x column is simply `xHeader`;
 * otherwise it is named after the first series on it.
 */
export function seriesToColumns(
  series: readonly CsvSeries[],
  xHeader: string,
  yHeader: (name: string) => string,
): CsvColumn[] {
  if (series.length === 0) return [{ header: xHeader, values: [] }];
  const groups: CsvSeries[][] = [];
  for (const s of series) {
    const group = groups.find((g) => sameGrid(g[0].x, s.x));
    if (group) group.push(s);
    else groups.push([s]);
  }
  return groups.flatMap((g) => [
    { header: groups.length === 1 ? xHeader : `${g[0].name} ${xHeader}`, values: g[0].x },
    ...g.map((s) => ({ header: yHeader(s.name), values: s.y })),
  ]);
}

export function seriesToCsv(series: readonly CsvSeries[], xHeader: string, yHeader: (name: string) => string): string {
  return columnsToCsv(seriesToColumns(series, xHeader, yHeader));
}

/** A file name from a chart title: lower case, ASCII, no path characters. */
export function fileNameFor(title: string, extension: string): string {
  const base = title
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/α/gi, 'a')
    .replace(/β/gi, 'b')
    .replace(/γ/gi, 'g')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 80);
  return `${base || 'bandcone-chart'}.${extension}`;
}

/** Triggers a download of text built in the page; nothing goes to the server. */
export function downloadText(fileName: string, text: string, mime = 'text/csv;charset=utf-8'): void {
  // The byte-order mark makes spreadsheets read line names such as "Hα" as UTF-8.
  const bom = mime.startsWith('text/csv') ? '\uFEFF' : '';
  const blob = new Blob([bom + text], { type: mime });
  const url = URL.createObjectURL(blob);
  try {
    downloadUrl(fileName, url);
  } finally {
    // Revoke after the click has been handled, or some browsers cancel the download.
    setTimeout(() => URL.revokeObjectURL(url), 0);
  }
}

export function downloadUrl(fileName: string, url: string): void {
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  a.rel = 'noopener';
  a.style.display = 'none';
  document.body.appendChild(a);
  a.click();
  a.remove();
}
