import { findLine } from '@/lib/engine/lines';

// The instrument words live with every other stored value's label (lib/labels.ts).
export { INSTRUMENT_LABELS as INSTRUMENT_NAMES } from '@/lib/labels';

export function lineName(id: string): string {
  return findLine(id)?.name ?? id;
}

export function lineLabel(id: string): string {
  const l = findLine(id);
  return l ? `${l.name} ${l.airNm.toFixed(2)} nm` : id;
}

export const SORT_NAMES: Record<string, string> = {
  relevance: 'Relevance',
  newest: 'Newest',
  cwl: 'CWL',
  fwhm: 'FWHM',
  peak: 'Peak T',
  throughput: 'Line throughput',
  contrast: 'Best contrast on this optic',
};

/** The contrast sort's sky models, as the catalogue names them (lib/engine/sky.ts SKY_MODELS). */
export const SKY_NAMES: Record<string, string> = {
  dark: 'Dark site',
  suburban: 'Suburban (Hg + Na)',
  'led-town': 'LED-lit town',
};

/** "3-5" → "3–5 nm", "30+" → "30 nm and wider". */
export function bucketLabel(key: string): string {
  if (key.endsWith('+')) return `${key.slice(0, -1)} nm and wider`;
  const [a, b] = key.split('-');
  return `${a}–${b} nm`;
}


/** A chip for what the search box's words were read as (read-query.ts). */
export function understoodLabel(u: { kind: string; params: Record<string, string | number | undefined> }): string {
  const p = u.params;
  const pc = (v: string | number | undefined) => `${Number((Number(v) * 100).toPrecision(4))} %`;
  switch (u.kind) {
    case 'line':
      return lineName(String(p.line));
    case 'width':
      return `FWHM ${p.fwhmMin}–${p.fwhmMax} nm`;
    case 'cwl':
      return `CWL ${p.cwlMin}–${p.cwlMax} nm`;
    case 'optic':
      return `f/${p.fNumber}`;
    case 'obstruction':
      return `obstruction ${pc(p.obstruction)}`;
    case 'threshold':
      return p.minThroughput !== undefined ? `keeps ≥ ${pc(p.minThroughput)} of the line` : `peak ≥ ${pc(p.peakMin)}`;
    default:
      return u.kind;
  }
}
