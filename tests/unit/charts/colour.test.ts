import { describe, expect, it } from 'vitest';
import {
  MAX_SERIES,
  OKABE_ITO,
  SERIES_DASHES,
  SERIES_SYMBOLS,
  contrast,
  ensureContrast,
  nightBrightness,
  parseHex,
  parseTriple,
  toHex,
} from '@/components/charts/colour';
import { buildTheme } from '@/components/charts/use-chart-theme';

const day = {
  paper: [248, 246, 241],
  panel: [255, 255, 252],
  ink: [28, 29, 33],
  muted: [88, 90, 98],
  rule: [214, 210, 200],
  accent: [164, 72, 30],
} as const;
const night = {
  paper: [0, 0, 0],
  panel: [12, 0, 0],
  ink: [232, 68, 47],
  muted: [217, 65, 47],
  rule: [90, 18, 10],
  accent: [255, 80, 56],
} as const;
const fonts = { fontText: 'sans-serif', fontFigures: 'monospace' };

function rgbOf(css: string): [number, number, number] {
  if (css.startsWith('#')) return parseHex(css) as [number, number, number];
  const m = css.match(/\d+(\.\d+)?/g)!.map(Number);
  return [m[0], m[1], m[2]];
}

/** A shade of red: red channel dominant, green and blue far below it (or black). */
function isRed(css: string): boolean {
  const [r, g, b] = rgbOf(css);
  if (r === 0 && g === 0 && b === 0) return true;
  return r > 0 && g <= r * 0.4 && b <= r * 0.3;
}

describe('colour helpers', () => {
  it('parses the CSS variable triples', () => {
    expect(parseTriple(' 28 29 33')).toEqual([28, 29, 33]);
    expect(parseTriple('1, 2, 3')).toEqual([1, 2, 3]);
    expect(parseTriple('')).toBeNull();
    expect(parseTriple('red')).toBeNull();
    expect(toHex(parseHex('#0072B2'))).toBe('#0072b2');
  });

  it('darkens only as far as needed and keeps the hue', () => {
    const yellow = parseHex('#F0E442');
    const out = ensureContrast(yellow, day.paper, 3);
    expect(contrast(out, day.paper)).toBeGreaterThanOrEqual(3);
    expect(contrast(out, day.paper)).toBeLessThan(3.1);
    // Same proportions between channels: same hue.
    expect(out[0] / out[1]).toBeCloseTo(yellow[0] / yellow[1], 5);
    const blue = parseHex('#0072B2');
    expect(ensureContrast(blue, day.paper, 3)).toBe(blue);
  });
});

describe('day theme', () => {
  const theme = buildTheme('day', day, fonts, true);

  it('uses the Okabe–Ito order with every series at least 3:1 on paper', () => {
    expect(theme.palette).toHaveLength(MAX_SERIES);
    for (const c of theme.palette) expect(contrast(rgbOf(c), day.paper)).toBeGreaterThanOrEqual(2.99);
    expect(theme.palette[0]).toBe(OKABE_ITO[0].toLowerCase());
  });

  it('gives each of the eight series a distinct marker and dash pairing', () => {
    const keys = new Set(Array.from({ length: MAX_SERIES }, (_, i) => `${theme.series(i).symbol}|${String(theme.series(i).dash)}`));
    expect(keys.size).toBe(MAX_SERIES);
    expect(new Set(SERIES_SYMBOLS).size).toBe(MAX_SERIES);
  });

  it('colours emission lines by wavelength, legibly', () => {
    const oiii = theme.lineMarker(500.68);
    const ha = theme.lineMarker(656.28);
    expect(oiii).not.toBe(ha);
    expect(contrast(rgbOf(oiii), day.panel)).toBeGreaterThanOrEqual(2.99);
    expect(contrast(rgbOf(theme.lineLabel(500.68)), day.panel)).toBeGreaterThanOrEqual(4.49);
    const [r, g, b] = rgbOf(ha);
    expect(r).toBeGreaterThan(g + b);
  });
});

describe('night theme', () => {
  const theme = buildTheme('night', night, fonts, true);

  it('uses nothing but red on black', () => {
    const colours = [
      theme.text,
      theme.muted,
      theme.axis,
      theme.grid,
      theme.rule,
      theme.accent,
      theme.accentSoft,
      theme.paper,
      theme.panel,
      theme.band.fill,
      theme.band.edge,
      theme.point.fill,
      theme.point.edge,
      ...theme.palette,
      ...theme.heatRamp,
      theme.lineMarker(500.68),
      theme.lineMarker(486.13),
      theme.lineLabel(500.68),
    ];
    for (const c of colours) expect(isRed(c), c).toBe(true);
  });

  it('tells eight series apart by brightness and dash, each readable on black', () => {
    const pairs = new Set(Array.from({ length: MAX_SERIES }, (_, i) => `${nightBrightness(i)}|${String(SERIES_DASHES[i])}`));
    expect(pairs.size).toBe(MAX_SERIES);
    for (const c of theme.palette) expect(contrast(rgbOf(c), night.panel)).toBeGreaterThanOrEqual(3);
  });

  it('ramps the heat map from black to the night accent', () => {
    expect(theme.heatRamp[0]).toBe('#000000');
    const top = parseHex(theme.heatRamp[theme.heatRamp.length - 1]);
    expect(top[0]).toBeLessThanOrEqual(night.accent[0]);
    expect(contrast(top, night.panel)).toBeGreaterThan(4.5);
  });
});
