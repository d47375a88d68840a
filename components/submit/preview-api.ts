import type { ApiFailure } from '@/components/account/json-form';
import type { CheckItem } from '@/components/review/check-list';
import type { z } from 'zod';
import type { ReadAssumptions } from '@/lib/engine/reader/types';
import type { readerOptionsSchema } from '@/lib/schemas/model';

/** The reader options the preview and the submission accept (the server's own schema). */
export type ReaderOptions = z.input<typeof readerOptionsSchema>;

/** What the reader assumed about a file (the engine's own type). */
export type Assumed = ReadAssumptions;

export type PreviewMetrics = {
  peakT: number;
  peakNm?: number;
  cwlNm: number | null;
  fwhmNm: number | null;
  meanInBandT: number | null;
  effectiveBandwidthNm: number | null;
  blockingOd: number | null;
  rangeNm?: [number, number];
  sampleCount?: number;
  medianStepNm?: number;
  lines: { id: string; wavelengthNm?: number; transmission: number; covered?: boolean }[];
};

export type PreviewResult = {
  points: { wavelengthNm: number[]; transmission: number[] };
  assumed: Assumed | null;
  metrics: PreviewMetrics;
  checks: CheckItem[];
  warnings: string[];
};

export type Outcome<T> = { ok: true; data: T } | { ok: false; status: number; failure: ApiFailure };

async function answer<T>(res: Response): Promise<Outcome<T>> {
  const data = await res.json().catch(() => ({ error: `The server answered ${res.status}.` }));
  if (!res.ok) return { ok: false, status: res.status, failure: data as ApiFailure };
  return { ok: true, data: data as T };
}

/** What the checks need from the form; sent with each preview so its checks match the submission's. */
export type PreviewMetadata = { lines?: string[]; nominalCwlNm?: number; nominalFwhmNm?: number; method?: Record<string, unknown> };

export async function previewFile(file: Blob, name: string, options: ReaderOptions, metadata: PreviewMetadata | undefined, signal?: AbortSignal): Promise<Outcome<PreviewResult>> {
  const form = new FormData();
  form.append('file', file, name);
  if (Object.keys(options).length > 0) form.append('options', JSON.stringify(options));
  if (metadata) form.append('metadata', JSON.stringify(metadata));
  try {
    return await answer<PreviewResult>(await fetch('/api/curves/preview', { method: 'POST', body: form, signal }));
  } catch (err) {
    if ((err as Error).name === 'AbortError') throw err;
    return { ok: false, status: 0, failure: { error: 'The preview could not reach the server; check the connection.' } };
  }
}

export type NeffFit = { nEff: number; cwl0Nm: number; rmsResidualNm: number };

export async function fitNeff(measurements: { aoiDeg: number; cwlNm: number }[], signal?: AbortSignal): Promise<Outcome<NeffFit>> {
  try {
    const res = await fetch('/api/model/neff', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ measurements }), signal });
    return await answer<NeffFit>(res);
  } catch (err) {
    if ((err as Error).name === 'AbortError') throw err;
    return { ok: false, status: 0, failure: { error: 'The fit could not reach the server.' } };
  }
}

/** Splits a server error into the part that belongs to one named file (the server prefixes "<name>: "). */
export function fileFailure(failure: ApiFailure, names: string[]): { name: string; message: string; lines: { line?: number; message: string }[] } | null {
  const name = names.find((n) => failure.error.startsWith(`${n}: `));
  if (!name) return null;
  const strip = (m: string) => (m.startsWith(`${name}: `) ? m.slice(name.length + 2) : m);
  return { name, message: strip(failure.error), lines: (failure.details ?? []).filter((d) => d.line !== undefined).map((d) => ({ line: d.line, message: strip(d.message) })) };
}
