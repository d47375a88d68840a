/**
 * Which field point a headline throughput is computed at: one rule for the
 * study, the curve page, the compare board and the catalogue.
 *
 * The headline is on axis (chief ray 0°, the centre of the field), where the
 * target is framed and where every optic, with or without a chief-ray angle,
 * can be compared. An optic's field edge (its saved chief-ray angle) is a second
 * number, always labelled as the edge. Only a field angle the reader types into
 * a search or the study moves the headline off axis, and then the words beside
 * it say so.
 */

import { formatDeg } from '@/components/charts/format';

/** The chief-ray angle a headline uses for this optic: 0° unless the reader typed one. */
export function headlineFieldAngle(typedFieldAngleDeg?: number | null): number {
  return typedFieldAngleDeg != null && Number.isFinite(typedFieldAngleDeg) && typedFieldAngleDeg > 0 ? typedFieldAngleDeg : 0;
}

/** The optic as a headline computes it: the same optic at the headline's field point. */
export function headlineOptic<O extends { fieldAngleDeg?: number | null }>(optic: O, typedFieldAngleDeg?: number | null): O & { fieldAngleDeg: number } {
  return { ...optic, fieldAngleDeg: headlineFieldAngle(typedFieldAngleDeg) };
}

/** The words stated beside a headline number: "on axis" or "at 8.0° off axis". */
export function fieldPointWords(fieldAngleDeg: number): string {
  return fieldAngleDeg > 0 ? `at ${formatDeg(fieldAngleDeg)} off axis` : 'on axis';
}

/** The words for the second number at the optic's field edge. */
export function fieldEdgeWords(fieldAngleDeg: number): string {
  return `at the ${formatDeg(fieldAngleDeg)} field edge`;
}
