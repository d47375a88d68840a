/**
 * Whole curves leave PostgreSQL as `array_send(float8[])`: the binary array
 * format, read here with a DataView. Formatting 2 000 doubles as text costs
 * PostgreSQL several times more than sending them, and parsing the text costs
 * Node as much again; the binary form also carries every double exactly.
 */

/** SQL for a float8[] column in binary form (a bytea, which node-postgres hands over as a Buffer). */
export const binaryArraySql = (column: string) => `array_send(${column})`;

/** Reads the binary form of a one-dimensional float8[] (PostgreSQL's array_send layout; NULL elements become NaN). */
export function readFloat8Array(buf: Buffer): number[] {
  const ndim = buf.readInt32BE(0);
  if (ndim === 0) return [];
  if (ndim !== 1) throw new Error(`expected a one-dimensional array, got ${ndim} dimensions`);
  const elementType = buf.readUInt32BE(8);
  if (elementType !== 701) throw new Error(`expected float8 elements (oid 701), got oid ${elementType}`);
  const n = buf.readInt32BE(12);
  const out = new Array<number>(n);
  let at = 20;
  for (let k = 0; k < n; k++) {
    const len = buf.readInt32BE(at);
    at += 4;
    if (len < 0) out[k] = NaN;
    else {
      out[k] = buf.readDoubleBE(at);
      at += len;
    }
  }
  return out;
}
