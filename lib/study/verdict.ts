/**
 * The verdict card in words: what a curve does on the chosen optic, each number
 * with its unit and a sentence that says what it means. Pure, so the words are
 * tested without a browser and the page and the CSV say the same thing.
 */

import { formatFNumber, formatNm, formatRatio, formatSignedNm, formatTransmission, fixed } from '@/components/charts/format';
import { CUSTOM_LINE_ID } from '@/lib/engine/cone-study';
import { findLine } from '@/lib/engine/lines';
import type { CurveStudy, StudyOptic } from './types';
import { fieldEdgeWords, fieldPointWords, headlineFieldAngle } from '@/lib/optics/headline-field';

export type Tone = 'good' | 'fair' | 'poor' | 'neutral';

export interface VerdictItem {
  key: string;
  label: string;
  value: string;
  /** The raw number behind `value`, for tests and the CSV. */
  raw: number | null;
  text: string;
  tone?: Tone;
}

export interface Verdict {
  lineLabel: string;
  headline: string;
  tone: Tone;
  items: VerdictItem[];
  warnings: string[];
}

/** Typical effective indices, said wherever the default is used (docs/model.md §Angle shift). */
export const NEFF_RANGES_TEXT =
  'common coatings sit at 1.5–1.9 (W. J. Smith, Modern Optical Engineering, ch. 11); hard-coated narrowband filters often at 1.8–2.3 (common practice)';

/** Below a tenth of a percentage point a better pre-shift is not worth mentioning. */
const NOTICEABLE_GAIN = 0.001;

export function toneOf(tau: number): Tone {
  if (tau >= 0.8) return 'good';
  if (tau >= 0.5) return 'fair';
  return 'poor';
}

export function lineLabel(study: Pick<CurveStudy, 'lineId' | 'lineNm'>, radialVelocityKms = 0): string {
  const line = study.lineId !== CUSTOM_LINE_ID ? findLine(study.lineId) : undefined;
  const name = line ? `${line.name} ${formatNm(line.airNm)}` : formatNm(study.lineNm);
  if (radialVelocityKms === 0 || !line) return name;
  return `${name}, seen at ${formatNm(study.lineNm)} (${radialVelocityKms > 0 ? '+' : ''}${radialVelocityKms} km/s)`;
}

/** A line's name without the wavelength some catalogue names carry ("[N II] 654.8" → "[N II]"). */
export function baseName(id: string): string {
  const name = findLine(id)?.name ?? id;
  return name.replace(/\s+\d+(\.\d+)?$/, '');
}

function direction(nm: number): string {
  return nm >= 0 ? 'toward the red' : 'toward the blue';
}

export function verdictFor(study: CurveStudy, optic: StudyOptic, preShiftNm: number, radialVelocityKms = 0): Verdict {
  const primary = study.onAxis.lines[0];
  const tau = primary.throughput;
  const label = lineLabel(study, radialVelocityKms);
  const shortName = study.lineId !== CUSTOM_LINE_ID ? (findLine(study.lineId)?.name ?? 'the line') : `the ${formatNm(study.lineNm)} line`;
  const items: VerdictItem[] = [];

  items.push({
    key: 'throughput',
    label: 'Line throughput',
    value: formatTransmission(tau),
    raw: tau,
    tone: toneOf(tau),
    text: `of ${shortName} reaches the sensor ${fieldPointWords(headlineFieldAngle())} through ${formatFNumber(optic.fNumber)} with a ${formatRatio(optic.obstruction)} obstruction; ${formatTransmission(primary.collimated)} in a collimated beam.`,
  });

  const neq = primary.speedEquivalentFNumber;
  items.push({
    key: 'speed',
    label: 'Speed-equivalent f-number',
    value: neq === null ? 'f/∞' : formatFNumber(neq),
    raw: neq,
    text:
      neq === null
        ? `No ${shortName} light gets through: the cone has moved the passband off the line.`
        : `This ${formatFNumber(optic.fNumber)} optic behaves like ${formatFNumber(neq)} on this line (an ideal filter of the same peak at ${formatFNumber(neq)} would collect as much line light).`,
  });

  if (study.edge) {
    const e = study.edge;
    items.push({
      key: 'edge',
      label: `At the field edge`,
      value: formatTransmission(e.throughput),
      raw: e.throughput,
      tone: toneOf(e.throughput),
      text: `${fieldEdgeWords(e.fieldAngleDeg).replace(/^at/, 'At')} (a ${fixed(e.fieldAngleDeg, 1)}° chief ray) the line keeps ${formatTransmission(e.throughput)}${e.speedEquivalentFNumber !== null ? `, like ${formatFNumber(e.speedEquivalentFNumber)}` : ''}.`,
    });
  }

  const best = study.onAxis.bestPreShift;
  if (best) {
    const gain = best.throughput - tau;
    const move = best.nm - preShiftNm;
    const worth = gain >= NOTICEABLE_GAIN;
    items.push({
      key: 'best-shift',
      label: 'Best pre-shift',
      value: formatSignedNm(best.nm),
      raw: best.nm,
      text: worth
        ? `Moving the passband ${formatSignedNm(move)} ${direction(move)}${preShiftNm !== 0 ? ` (to ${formatSignedNm(best.nm)} against the measured curve)` : ''} would raise ${shortName} to ${formatTransmission(best.throughput)}, ${fixed(gain * 100, 1)} points more.`
        : `The passband already sits at its best position for this optic: ${formatTransmission(best.throughput)} at ${formatSignedNm(best.nm)}.`,
      tone: worth && gain > 0.05 ? 'fair' : 'neutral',
    });
  } else {
    items.push({ key: 'best-shift', label: 'Best pre-shift', value: '—', raw: null, text: 'This curve has no FWHM, so no best pre-shift can be searched.' });
  }

  for (const nb of study.onAxis.neighbours) {
    const name = baseName(nb.id);
    items.push({
      key: `neighbour-${nb.id}`,
      label: `${name} ${formatNm(nb.wavelengthNm)}`,
      value: formatTransmission(nb.throughput),
      raw: nb.throughput,
      text: `of the neighbouring ${name} line passes as well (${formatTransmission(nb.collimated)} collimated)${nb.throughput > 0.5 ? ': this filter will not separate the two' : nb.throughput > 0.1 ? ': noticeable leakage' : ''}.`,
    });
  }

  const contrast = study.onAxis.contrast;
  items.push({
    key: 'contrast',
    label: 'Contrast figure',
    value: contrast === null ? '—' : `${fixed(contrast, 3)} /nm`,
    raw: contrast,
    text:
      contrast === null
        ? 'Undefined: the cone-averaged curve has no effective bandwidth.'
        : `Line throughput per nm of cone-averaged bandwidth (${formatNm(study.coneBandwidthNm)}); higher means more line against the same sky background.`,
  });

  const nText =
    study.nEffSource === 'fitted'
      ? 'fitted from the angles this unit was measured at'
      : study.nEffSource === 'typed'
        ? 'as typed'
        : `a default: this curve has no fitted value; ${NEFF_RANGES_TEXT}`;
  const sp = study.nEffPolarised;
  items.push(
    sp
      ? {
          key: 'neff',
          label: 'Effective index',
          value: `s ${formatRatio(sp.s)} · p ${formatRatio(sp.p)}`,
          raw: study.nEff,
          text: `fitted separately for s and p light from this unit's polarised curves; the cone averages the two halves of unpolarised light, each with its own index (${formatRatio(study.nEff)} for both together).`,
        }
      : { key: 'neff', label: 'Effective index', value: formatRatio(study.nEff), raw: study.nEff, text: `${nText}.` },
  );

  if (study.totalShiftNm !== 0) {
    const temp = study.totalShiftNm - preShiftNm;
    items.push({
      key: 'shift',
      label: 'Passband moved',
      value: formatSignedNm(study.totalShiftNm),
      raw: study.totalShiftNm,
      text: `${preShiftNm !== 0 ? `Pre-shift ${formatSignedNm(preShiftNm)}` : 'No pre-shift'}${temp !== 0 ? `, temperature ${formatSignedNm(temp)} (reference ${fixed(study.refTempC, 1)} °C${study.refTempSource === 'measured' ? ', as measured' : ''})` : ''}.`,
    });
  }

  const headline =
    neq === null
      ? `${label}: nothing gets through on this optic`
      : `${label}: ${formatTransmission(tau)} of the line gets through, like ${formatFNumber(neq)}`;

  return { lineLabel: label, headline, tone: toneOf(tau), items, warnings: study.onAxis.warnings };
}
