/**
 * Derived numbers of a curve, exactly as docs/model.md §Derived numbers defines them. Anything that
 * cannot be defined comes back as null with a sentence in `warnings`.
 */

import { cumulativeAt, interpolate, isCovered, prepareCurve, type PreparedCurve } from './curve';
import { LINES } from './lines';
import type { CurvePoints, LineMetric, Metrics } from './types';

/**
 * Deepest blocking reported. Below 10⁻⁶ a transmission reading is at the floor
 * of ordinary spectrophotometers (common practice), so deeper values are
 * reported as this cap rather than as a number the data cannot support.
 */
export const BLOCKING_OD_CAP = 6;

export interface HalfMaximum {
  leftNm: number | null;
  rightNm: number | null;
}

/**
 * Walks out from the global maximum to the first sample at or below half of it
 * on each side and places the crossing by linear interpolation.
 */
export function halfMaximumEdges(c: PreparedCurve, level = c.peak / 2): HalfMaximum {
  const { x, y, n, peakIndex } = c;
  let leftNm: number | null = null;
  let rightNm: number | null = null;
  for (let j = peakIndex - 1; j >= 0; j--) {
    if (y[j] <= level) {
      leftNm = y[j] === level ? x[j] : x[j] + ((level - y[j]) / (y[j + 1] - y[j])) * (x[j + 1] - x[j]);
      break;
    }
  }
  for (let j = peakIndex + 1; j < n; j++) {
    if (y[j] <= level) {
      rightNm = y[j] === level ? x[j] : x[j - 1] + ((y[j - 1] - level) / (y[j - 1] - y[j])) * (x[j] - x[j - 1]);
      break;
    }
  }
  return { leftNm, rightNm };
}

export function medianStep(c: PreparedCurve): number {
  const d = new Float64Array(c.n - 1);
  for (let j = 0; j < c.n - 1; j++) d[j] = c.x[j + 1] - c.x[j];
  d.sort();
  const m = d.length >> 1;
  return d.length % 2 ? d[m] : 0.5 * (d[m - 1] + d[m]);
}

export function lineTransmissions(c: PreparedCurve): LineMetric[] {
  return LINES.map((l) => ({
    id: l.id,
    wavelengthNm: l.airNm,
    transmission: interpolate(c, l.airNm),
    covered: isCovered(c, l.airNm),
  }));
}

export function computeMetrics(points: CurvePoints | PreparedCurve): Metrics {
  const c = prepareCurve(points);
  const warnings: string[] = [];
  const peakT = c.peak;
  const peakNm = c.x[c.peakIndex];
  const base = {
    peakT,
    peakNm,
    rangeNm: [c.xMin, c.xMax] as [number, number],
    sampleCount: c.n,
    medianStepNm: medianStep(c),
    lines: lineTransmissions(c),
    warnings,
  };

  if (!(peakT > 0)) {
    warnings.push('The curve never rises above zero, so it has no passband: CWL, FWHM, in-band mean, effective bandwidth and blocking are undefined.');
    return { ...base, leftNm: null, rightNm: null, cwlNm: null, fwhmNm: null, meanInBandT: null, effectiveBandwidthNm: null, blockingOd: null };
  }

  const effectiveBandwidthNm = c.total / peakT;
  const { leftNm, rightNm } = halfMaximumEdges(c);
  if (leftNm === null) warnings.push('The curve does not fall to half its peak on the blue side within the measured range, so FWHM and CWL are undefined.');
  if (rightNm === null) warnings.push('The curve does not fall to half its peak on the red side within the measured range, so FWHM and CWL are undefined.');
  if (leftNm === null || rightNm === null) {
    warnings.push('Mean in-band transmission and blocking need the half-maximum edges and are undefined.');
    return { ...base, leftNm, rightNm, cwlNm: null, fwhmNm: null, meanInBandT: null, effectiveBandwidthNm, blockingOd: null };
  }

  const fwhmNm = rightNm - leftNm;
  const cwlNm = 0.5 * (leftNm + rightNm);
  const meanInBandT = fwhmNm > 0 ? (cumulativeAt(c, rightNm) - cumulativeAt(c, leftNm)) / fwhmNm : peakT;

  const lo = cwlNm - 2 * fwhmNm;
  const hi = cwlNm + 2 * fwhmNm;
  let outside = 0;
  let maxOutside = 0;
  for (let j = 0; j < c.n; j++) {
    if (c.x[j] < lo || c.x[j] > hi) {
      outside++;
      if (c.y[j] > maxOutside) maxOutside = c.y[j];
    }
  }
  let blockingOd: number | null;
  if (outside === 0) {
    blockingOd = null;
    warnings.push('No samples lie outside CWL ± 2·FWHM, so blocking is undefined.');
  } else if (maxOutside <= 10 ** -BLOCKING_OD_CAP) {
    blockingOd = BLOCKING_OD_CAP;
    warnings.push(`Transmission outside CWL ± 2·FWHM is at or below 1e-${BLOCKING_OD_CAP}; blocking is reported at the ${BLOCKING_OD_CAP} OD reporting limit.`);
  } else {
    blockingOd = -Math.log10(maxOutside);
  }

  return { ...base, leftNm, rightNm, cwlNm, fwhmNm, meanInBandT, effectiveBandwidthNm, blockingOd };
}
