'use client';

import { useMemo, useSyncExternalStore } from 'react';
import { lineColor } from '@/lib/engine/lines';
import {
  CONE_DASH,
  DAY_WIDTHS,
  MAX_SERIES,
  NIGHT_WIDTHS,
  OKABE_ITO,
  SERIES_DASHES,
  SERIES_SYMBOLS,
  dayHeatRamp,
  ensureContrast,
  nightBrightness,
  nightHeatRamp,
  parseHex,
  parseTriple,
  rgba,
  scale,
  toHex,
  type Dash,
  type Rgb,
  type SymbolShape,
} from './colour';

export type ChartView = 'day' | 'night';

export interface SeriesStyle {
  color: string;
  dash: Dash;
  width: number;
  symbol: SymbolShape;
}

export interface ChartTheme {
  view: ChartView;
  /** False until the CSS variables have been read in the browser; charts wait for it so night never flashes day colours. */
  ready: boolean;
  text: string;
  muted: string;
  /** Axis lines and ticks. */
  axis: string;
  /** Split lines inside the plot. */
  grid: string;
  rule: string;
  accent: string;
  accentSoft: string;
  /** Canvas background: the figure's panel shows through. */
  background: 'transparent';
  paper: string;
  panel: string;
  fontText: string;
  fontFigures: string;
  /** Up to eight series colours, in order. */
  palette: readonly string[];
  /** Colour, dash, width and marker for the series at `index`, so series differ without colour. */
  series(index: number): SeriesStyle;
  /** Dash for cone-averaged curves. */
  coneDash: readonly number[];
  /** Colour of a catalogued emission-line marker at `nm`. */
  lineMarker(nm: number): string;
  /** Text colour of that marker's name: the same hue, dark enough for 4.5:1. */
  lineLabel(nm: number): string;
  /** Fill and edge of the shaded nominal passband. */
  band: { fill: string; edge: string };
  /** Low → high ramp for heat maps. */
  heatRamp: readonly string[];
  /** Fill and edge of points drawn over a heat map, visible on both ends of the ramp. */
  point: { fill: string; edge: string };
}

// Fallbacks mirror app/globals.css, used only before the browser has been read.
const DAY: Record<string, Rgb> = {
  paper: [248, 246, 241],
  panel: [255, 255, 252],
  ink: [28, 29, 33],
  muted: [88, 90, 98],
  rule: [214, 210, 200],
  accent: [164, 72, 30],
};

function subscribe(onChange: () => void): () => void {
  window.addEventListener('bandcone:view', onChange);
  // Belt and braces: anything that flips the attribute without the event still re-themes.
  const observer = new MutationObserver(onChange);
  observer.observe(document.documentElement, { attributes: true, attributeFilter: ['data-view', 'class', 'style'] });
  // Canvas text is drawn once; redraw when the web fonts arrive so labels use them.
  const fonts = document.fonts;
  fonts?.addEventListener?.('loadingdone', onChange);
  return () => {
    window.removeEventListener('bandcone:view', onChange);
    observer.disconnect();
    fonts?.removeEventListener?.('loadingdone', onChange);
  };
}

function snapshot(): string {
  const view = document.documentElement.dataset.view === 'night' ? 'night' : 'day';
  return `${view}|${document.fonts?.status ?? 'loaded'}`;
}

function serverSnapshot(): string {
  return 'server';
}

function readVars(): { vars: Record<string, Rgb>; fontText: string; fontFigures: string } {
  const css = getComputedStyle(document.documentElement);
  const vars: Record<string, Rgb> = {};
  for (const name of Object.keys(DAY)) vars[name] = parseTriple(css.getPropertyValue(`--c-${name}`)) ?? DAY[name];
  const fontText = css.getPropertyValue('--font-text').trim();
  const fontFigures = css.getPropertyValue('--font-figures').trim();
  return {
    vars,
    fontText: fontText ? `${fontText}, system-ui, sans-serif` : 'system-ui, sans-serif',
    fontFigures: fontFigures ? `${fontFigures}, ui-monospace, monospace` : 'ui-monospace, monospace',
  };
}

export function buildTheme(
  view: ChartView,
  vars: Record<string, Rgb>,
  fonts: { fontText: string; fontFigures: string },
  ready: boolean,
): ChartTheme {
  const { paper, panel, ink, muted, rule, accent } = vars;
  // What day and night share; each view adds its own greys, markers, bands and ramp.
  const common = (palette: string[], widths: readonly number[]) => ({
    view,
    ready,
    text: rgba(ink),
    muted: rgba(muted),
    rule: rgba(rule),
    accent: rgba(accent),
    background: 'transparent' as const,
    paper: rgba(paper),
    panel: rgba(panel),
    ...fonts,
    palette,
    series: (i: number) => ({
      color: palette[i % MAX_SERIES],
      dash: SERIES_DASHES[i % MAX_SERIES],
      width: widths[i % MAX_SERIES],
      symbol: SERIES_SYMBOLS[i % MAX_SERIES],
    }),
    coneDash: CONE_DASH,
  });

  if (view === 'night') {
    // Every colour is a brightness of the night accent: red on black, nothing else.
    const red = (i: number) => toHex(scale(accent, nightBrightness(i)));
    return {
      ...common(Array.from({ length: MAX_SERIES }, (_, i) => red(i)), NIGHT_WIDTHS),
      axis: rgba(scale(muted, 0.8)),
      grid: rgba(rule, 0.85),
      accentSoft: rgba(accent, 0.18),
      lineMarker: () => rgba(scale(muted, 0.85)),
      lineLabel: () => rgba(muted),
      band: { fill: rgba(rule, 0.45), edge: rgba(scale(muted, 0.7)) },
      heatRamp: nightHeatRamp(accent),
      point: { fill: rgba([0, 0, 0]), edge: rgba(accent) },
    };
  }

  return {
    ...common(OKABE_ITO.map((hex) => toHex(ensureContrast(parseHex(hex), paper, 3))), DAY_WIDTHS),
    axis: rgba(muted),
    grid: rgba(rule, 0.7),
    accentSoft: rgba(accent, 0.12),
    // The hue of the wavelength itself, darkened only as far as 3:1 on paper needs.
    lineMarker: (nm) => toHex(ensureContrast(parseHex(lineColor(nm)), panel, 3)),
    lineLabel: (nm) => toHex(ensureContrast(parseHex(lineColor(nm)), panel, 4.5)),
    band: { fill: rgba(accent, 0.09), edge: rgba(accent, 0.45) },
    heatRamp: dayHeatRamp(paper, accent, ink),
    point: { fill: rgba(panel), edge: rgba(ink) },
  };
}

const FALLBACK_FONTS = { fontText: 'system-ui, sans-serif', fontFigures: 'ui-monospace, monospace' };

/**
 * The chart colours of the current view, read from the CSS variables so charts and
 * page never disagree, and re-read whenever the night view is toggled.
 */
export function useChartTheme(): ChartTheme {
  const key = useSyncExternalStore(subscribe, snapshot, serverSnapshot);
  return useMemo(() => {
    if (key === 'server') return buildTheme('day', DAY, FALLBACK_FONTS, false);
    const { vars, fontText, fontFigures } = readVars();
    return buildTheme(key.startsWith('night') ? 'night' : 'day', vars, { fontText, fontFigures }, true);
  }, [key]);
}
