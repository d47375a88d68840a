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

export function bucketRange(key: string): { fwhmMin: string; fwhmMax: string } {
  if (key.endsWith('+')) return { fwhmMin: key.slice(0, -1), fwhmMax: '' };
  const [a, b] = key.split('-');
  return { fwhmMin: a, fwhmMax: b };
}
