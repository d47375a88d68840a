/**
 * Number formats used wherever a chart, table or verdict shows a measured value.
 * One place, so a wavelength reads `656.28 nm` in a tooltip, a table cell and a CSV header alike.
 *
 * Units are separated by a plain space (not a no-break space) so text search and
 * copy-paste behave predictably; table cells that must not wrap use `whitespace-nowrap`.
 */

/** Shown for a missing or non-finite number, so a gap never reads as zero. */
export const MISSING = '—';

/**
 * Round half away from zero at `decimals` places. `toFixed` alone rounds the binary
 * value, so 1.005 would become "1.00"; shifting through the exponent avoids that.
 */
export function roundTo(value: number, decimals: number): number {
  if (!Number.isFinite(value)) return value;
  const sign = value < 0 ? -1 : 1;
  const shifted = Math.round(Number(`${Math.abs(value)}e${decimals}`));
  const out = sign * Number(`${shifted}e-${decimals}`);
  // -0 would print as "-0.00" in some paths; a rounded zero has no sign.
  return out === 0 ? 0 : out;
}

export function fixed(value: number | null | undefined, decimals: number): string {
  if (value == null || !Number.isFinite(value)) return MISSING;
  return roundTo(value, decimals).toFixed(decimals);
}

function withUnit(value: number | null | undefined, decimals: number, unit: string): string {
  const text = fixed(value, decimals);
  return text === MISSING ? MISSING : `${text} ${unit}`;
}

/** Wavelengths, CWL and FWHM: 2 decimals, in nm. */
export function formatNm(nm: number | null | undefined, decimals = 2): string {
  return withUnit(nm, decimals, 'nm');
}

/** Shifts and offsets carry an explicit sign, because "0.62 nm" alone hides the direction. */
export function formatSignedNm(nm: number | null | undefined, decimals = 2): string {
  const text = formatNm(nm, decimals);
  if (text === MISSING || nm == null) return text;
  return roundTo(nm, decimals) > 0 ? `+${text}` : text;
}

export function formatFwhm(nm: number | null | undefined, decimals = 2): string {
  const text = formatNm(nm, decimals);
  return text === MISSING ? MISSING : `${text} FWHM`;
}

/** A value already expressed in percent. */
export function formatPercent(percent: number | null | undefined, decimals = 1): string {
  return withUnit(percent, decimals, '%');
}

/** Transmission and throughput are stored as fractions 0–1 and shown in percent. */
export function formatTransmission(fraction: number | null | undefined, decimals = 1): string {
  if (fraction == null || !Number.isFinite(fraction)) return MISSING;
  return formatPercent(fraction * 100, decimals);
}

export function formatFNumber(n: number | null | undefined, decimals = 1): string {
  const text = fixed(n, decimals);
  return text === MISSING ? MISSING : `f/${text}`;
}

export function formatDeg(deg: number | null | undefined, decimals = 1): string {
  const text = fixed(deg, decimals);
  return text === MISSING ? MISSING : `${text}°`;
}

/** Unitless ratios such as the central obstruction (0.36) or an effective index. */
export function formatRatio(value: number | null | undefined, decimals = 2): string {
  return fixed(value, decimals);
}

/**
 * How an axis or tooltip should print its numbers. A plain string or object (never a
 * function) so that server components can pass it to the client charts.
 */
export type ValueFormat =
  | 'nm'
  | 'nm-signed'
  | 'percent'
  | 'fraction-percent'
  | 'fnumber'
  | 'deg'
  | 'ratio'
  | 'number'
  | { decimals: number; unit?: string; signed?: boolean };

/** Full-precision text with its unit, for tooltips, summaries and table cells. */
export function formatValue(value: number | null | undefined, format: ValueFormat = 'number'): string {
  switch (format) {
    case 'nm':
      return formatNm(value);
    case 'nm-signed':
      return formatSignedNm(value);
    case 'percent':
      return formatPercent(value);
    case 'fraction-percent':
      return formatTransmission(value);
    case 'fnumber':
      return formatFNumber(value);
    case 'deg':
      return formatDeg(value);
    case 'ratio':
      return formatRatio(value);
    case 'number':
      return fixed(value, 2);
    default: {
      const text = fixed(value, format.decimals);
      if (text === MISSING || value == null) return text;
      const signed = format.signed && roundTo(value, format.decimals) > 0 ? `+${text}` : text;
      if (!format.unit) return signed;
      return format.unit === '°' ? `${signed}°` : `${signed} ${format.unit}`;
    }
  }
}

/**
 * Axis tick text: the axis name already carries the unit, and ticks fall on round
 * numbers, so print the shortest exact form (650, 652.5) rather than a fixed width.
 */
export function formatTick(value: number, format: ValueFormat = 'number'): string {
  if (!Number.isFinite(value)) return '';
  const short = String(roundTo(value, 6));
  switch (format) {
    case 'fnumber':
      return `f/${short}`;
    case 'deg':
      return `${short}°`;
    case 'fraction-percent':
      return String(roundTo(value * 100, 4));
    case 'nm-signed':
      return roundTo(value, 6) > 0 ? `+${short}` : short;
    default:
      if (typeof format === 'object' && format.signed && roundTo(value, 6) > 0) return `+${short}`;
      return short;
  }
}

/** The unit an axis name should show in brackets, e.g. "Wavelength (nm)". */
export function unitOf(format: ValueFormat | undefined): string | undefined {
  switch (format) {
    case 'nm':
    case 'nm-signed':
      return 'nm';
    case 'percent':
    case 'fraction-percent':
      return '%';
    case 'deg':
      return '°';
    case undefined:
    case 'fnumber':
    case 'ratio':
    case 'number':
      return undefined;
    default:
      return format.unit;
  }
}
