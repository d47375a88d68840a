/** Shapes the catalogue pages receive from GET /api/curves (lib/catalogue/search.ts). */
export interface ResultItem {
  id: number;
  title: string;
  label: string;
  maker: string | null;
  lines: string[];
  cwlNm: number | null;
  fwhmNm: number | null;
  peakT: number;
  status: string;
  instrument: string;
  aoiDeg: number;
  verifiedAt: string | null;
  throughput?: number;
  speedEquivalentFNumber?: number | null;
  snippet?: string;
  sparkline: { wavelengthNm: number[]; transmission: number[] };
}

export interface Facet {
  key: string;
  count: number;
}

export interface SearchResponse {
  items: ResultItem[];
  total: number;
  page: number;
  pageSize: number;
  sort: string;
  dir: 'asc' | 'desc';
  facets: { line: Facet[]; method: Facet[]; fwhm: Facet[] };
  fitness?: { lineId: string | null; fNumber: number; obstruction: number; nEff: number | null; fieldAngleDeg: number; gridLevel: number };
}

/** An optic the fitness filter can be set from: the public examples, and the reader's own. */
export interface OpticChoice {
  id: number;
  name: string;
  fNumber: number;
  obstruction: number;
  fieldAngleDeg: number;
  mine: boolean;
}

/** The URL state of a search: every value as the query string carries it. */
export type Query = Record<string, string>;
