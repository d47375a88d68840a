/**
 * Colour arithmetic and the fixed series styles of the chart kit. Pure, so the
 * contrast rules can be unit-tested without a browser.
 */

export type Rgb = readonly [number, number, number];

/** Parses the "R G B" triples the CSS variables hold (also accepts commas). */
export function parseTriple(text: string | null | undefined): Rgb | null {
  if (!text) return null;
  const parts = text.trim().split(/[\s,]+/).map(Number);
  if (parts.length < 3 || parts.slice(0, 3).some((n) => !Number.isFinite(n))) return null;
  return [parts[0], parts[1], parts[2]];
}

export function parseHex(hex: string): Rgb {
  const h = hex.replace('#', '');
  const full = h.length === 3 ? h.split('').map((c) => c + c).join('') : h;
  return [0, 2, 4].map((i) => parseInt(full.slice(i, i + 2), 16)) as unknown as Rgb;
}

export function toHex(rgb: Rgb): string {
  return '#' + rgb.map((v) => Math.max(0, Math.min(255, Math.round(v))).toString(16).padStart(2, '0')).join('');
}

export function rgba(rgb: Rgb, alpha = 1): string {
  const [r, g, b] = rgb.map((v) => Math.round(v));
  return alpha >= 1 ? `rgb(${r}, ${g}, ${b})` : `rgba(${r}, ${g}, ${b}, ${alpha})`;
}

function channel(v: number): number {
  const c = v / 255;
  return c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}

/** WCAG relative luminance. */
export function luminance(rgb: Rgb): number {
  return 0.2126 * channel(rgb[0]) + 0.7152 * channel(rgb[1]) + 0.0722 * channel(rgb[2]);
}

export function contrast(a: Rgb, b: Rgb): number {
  const la = luminance(a);
  const lb = luminance(b);
  return (Math.max(la, lb) + 0.05) / (Math.min(la, lb) + 0.05);
}

export function scale(rgb: Rgb, factor: number): Rgb {
  return [rgb[0] * factor, rgb[1] * factor, rgb[2] * factor];
}

export function mix(a: Rgb, b: Rgb, t: number): Rgb {
  return [a[0] + (b[0] - a[0]) * t, a[1] + (b[1] - a[1]) * t, a[2] + (b[2] - a[2]) * t];
}

/**
 * Darkens (on a light background) or lightens towards `towards` until the colour
 * reaches `ratio` against `background`. The hue is kept, so a spectral line colour
 * stays the colour of its wavelength while meeting WCAG 1.4.11 (3:1 for graphics).
 */
export function ensureContrast(colour: Rgb, background: Rgb, ratio = 3, towards: Rgb = [0, 0, 0]): Rgb {
  if (contrast(colour, background) >= ratio) return colour;
  let lo = 0;
  let hi = 1;
  for (let i = 0; i < 24; i++) {
    const mid = (lo + hi) / 2;
    if (contrast(mix(colour, towards, mid), background) >= ratio) hi = mid;
    else lo = mid;
  }
  return mix(colour, towards, hi);
}

/**
 * Day series order: the Okabe–Ito palette (Okabe & Ito, "Color Universal Design",
 * 2002), an openly published set chosen to stay distinguishable under the common
 * colour-vision deficiencies. Ordered so the first five already reach about 3:1 on
 * paper; the lighter members (orange, sky blue, yellow) come last and are darkened in
 * the same hue by `ensureContrast` at run time.
 */
export const OKABE_ITO: readonly string[] = [
  '#0072B2', // blue
  '#D55E00', // vermillion
  '#009E73', // bluish green
  '#CC79A7', // reddish purple
  '#000000', // black
  '#E69F00', // orange
  '#56B4E9', // sky blue
  '#F0E442', // yellow
];

/** The design never shows more than eight series; styles repeat past that. */
export const MAX_SERIES = 8;

export type Dash = 'solid' | readonly number[];

/**
 * Second and third channels besides colour, so series stay apart in grey print, for
 * every colour vision and in the all-red night view. Index-aligned with the palettes.
 */
export const SERIES_DASHES: readonly Dash[] = ['solid', [8, 4], [2, 3], [10, 3, 2, 3], 'solid', [8, 4], [2, 3], [10, 3, 2, 3]];

export type SymbolShape =
  | 'circle'
  | 'rect'
  | 'triangle'
  | 'diamond'
  | 'emptyCircle'
  | 'emptyRect'
  | 'emptyTriangle'
  | 'emptyDiamond';

export const SERIES_SYMBOLS: readonly SymbolShape[] = [
  'circle',
  'rect',
  'triangle',
  'diamond',
  'emptyCircle',
  'emptyRect',
  'emptyTriangle',
  'emptyDiamond',
];

/** Dash used for cone-averaged curves: always the same, so "dashed = cone" reads at a glance. */
export const CONE_DASH: readonly number[] = [7, 4];

/**
 * Night reds: three brightness steps of the night accent, the dimmest still 3:1 on
 * black. Combined with the dash list every one of the eight (brightness, dash) pairs
 * is different.
 */
export const NIGHT_BRIGHTNESS: readonly number[] = [1, 0.85, 0.68];
export const NIGHT_WIDTHS: readonly number[] = [2.25, 1.75, 1.5, 2, 1.5, 2.25, 1.75, 2.5];
export const DAY_WIDTHS: readonly number[] = [2, 2, 2, 2, 2, 2, 2, 2];

/** Brightness step per series index: (bright, mid, dim, bright, mid, dim, bright, mid). */
export function nightBrightness(index: number): number {
  return NIGHT_BRIGHTNESS[index % MAX_SERIES % NIGHT_BRIGHTNESS.length];
}

/**
 * Sequential ramps for heat maps, low → high throughput. Day: warm paper to the copper
 * accent to a deep brown, monotonic in lightness so it reads without hue. Night:
 * black to the night accent, red only.
 */
export function dayHeatRamp(paper: Rgb, accent: Rgb, ink: Rgb): string[] {
  return [
    toHex(mix(paper, [250, 236, 200], 0.6)),
    toHex([236, 196, 120]),
    toHex(mix(accent, [236, 160, 80], 0.45)),
    toHex(accent),
    toHex(mix(accent, ink, 0.55)),
  ];
}

export function nightHeatRamp(accent: Rgb): string[] {
  // Tops out below full accent: a heat map can fill half a screen, and the night view is meant to be dim.
  return [toHex([0, 0, 0]), toHex(scale(accent, 0.2)), toHex(scale(accent, 0.4)), toHex(scale(accent, 0.62)), toHex(scale(accent, 0.85))];
}
