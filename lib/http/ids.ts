/**
 * Ids in paths, read strictly: a row id is 1–10 decimal digits, nothing else
 * (no "0x10", "1e3", " 7", "+7" or "7.0", which Number() would accept), from 1
 * to 2^31−1, the range of a PostgreSQL integer; a user id is a UUID. Anything
 * else answers 404 like a missing row, before the database is asked.
 */

import { notFound } from './errors';
import { readId } from './read-id';

/** A row id from a path, or a 404. */
export function parseId(raw: string, what = 'item'): number {
  const id = readId(raw);
  if (id === null) throw notFound(`No such ${what}.`);
  return id;
}

function isHex(c: string): boolean {
  return (c >= '0' && c <= '9') || (c >= 'a' && c <= 'f') || (c >= 'A' && c <= 'F');
}

/** Whether the text is a UUID in its 8-4-4-4-12 hex form (RFC 9562). */
export function isUuid(raw: string): boolean {
  return typeof raw === 'string' && raw.length === 36 && [...raw].every((c, i) => ([8, 13, 18, 23].includes(i) ? c === '-' : isHex(c)));
}

/** A UUID in its 8-4-4-4-12 hex form (RFC 9562), or a 404. */
export function parseUuid(raw: string, what = 'item'): string {
  if (!isUuid(raw)) throw notFound(`No such ${what}.`);
  return raw.toLowerCase();
}
