/** A WHERE clause built piece by piece with positional bind parameters ($1, $2, …). */
export class SqlParts {
  readonly bind: unknown[] = [];

  /** Adds a value and returns its placeholder. */
  param(value: unknown, cast = ''): string {
    this.bind.push(value);
    return `$${this.bind.length}${cast}`;
  }
}

export function and(clauses: (string | null | undefined | false)[]): string {
  const kept = clauses.filter((c): c is string => typeof c === 'string' && c.length > 0);
  return kept.length === 0 ? 'true' : kept.map((c) => `(${c})`).join(' AND ');
}

/** Turns ts_headline's sentinel-marked text into HTML with only <mark> as markup. */
export const MARK_START = '\u0002';
export const MARK_END = '\u0003';

export function snippetHtml(raw: string | null | undefined): string | undefined {
  if (!raw) return undefined;
  const escaped = raw.replace(/[&<>"']/g, (ch) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[ch]!);
  return escaped.split(MARK_START).join('<mark>').split(MARK_END).join('</mark>');
}
