// The shapes GET /api/curves answers with, taken from the code that builds them (types only: nothing server-side reaches the bundle).
export type { SearchItem as ResultItem, FacetCount as Facet, SearchResult as SearchResponse } from '@/lib/catalogue/search';

/** An optic the fitness filter can be set from: the public examples, and the reader's own. */
export type { OpticChoice } from '@/lib/catalogue/optic-choices';

/** The URL state of a search: every value as the query string carries it. */
export type Query = Record<string, string>;
