/** Unit-to-unit spread of CWL and FWHM across curves that share a filter label. */

export interface SpreadStats {
  mean: number | null;
  /** Sample standard deviation (n − 1); null below two values. */
  sd: number | null;
  min: number | null;
  max: number | null;
}

export interface UnitSpread {
  count: number;
  cwl: SpreadStats;
  fwhm: SpreadStats;
}

function stats(values: number[]): SpreadStats {
  const v = values.filter((x) => typeof x === 'number' && Number.isFinite(x));
  const n = v.length;
  if (n === 0) return { mean: null, sd: null, min: null, max: null };
  const mean = v.reduce((s, x) => s + x, 0) / n;
  const sd = n < 2 ? null : Math.sqrt(v.reduce((s, x) => s + (x - mean) ** 2, 0) / (n - 1));
  return { mean, sd, min: Math.min(...v), max: Math.max(...v) };
}

export function unitSpread(values: { cwlNm: number | null; fwhmNm: number | null }[]): UnitSpread {
  return {
    count: values.length,
    cwl: stats(values.map((v) => v.cwlNm as number)),
    fwhm: stats(values.map((v) => v.fwhmNm as number)),
  };
}
