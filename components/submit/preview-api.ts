// The submission page's names for the preview's types (the server's own, through lib/api-client.ts), and how it reads a refusal that names a file.
import type { ApiFailure } from '@/lib/api-client';
import type { PreviewAnswer } from '@/lib/engine/preview';

export type { ReaderOptions, PreviewMetadata } from '@/lib/api-client';
/** What the reader assumed about a file (the engine's own type). */
export type { ReadAssumptions as Assumed } from '@/lib/engine/reader/types';
export type { NeffAnswer as NeffFit } from '@/lib/engine/neff';
export type PreviewResult = PreviewAnswer;
export type PreviewMetrics = PreviewAnswer['metrics'];

/** Splits a server error into the part that belongs to one named file (the server prefixes "<name>: "). */
export function fileFailure(failure: ApiFailure, names: string[]): { name: string; message: string; lines: { line?: number; message: string }[] } | null {
  const name = names.find((n) => failure.error.startsWith(`${n}: `));
  if (!name) return null;
  const strip = (m: string) => (m.startsWith(`${name}: `) ? m.slice(name.length + 2) : m);
  return { name, message: strip(failure.error), lines: (failure.details ?? []).filter((d) => d.line !== undefined).map((d) => ({ line: d.line, message: strip(d.message) })) };
}
