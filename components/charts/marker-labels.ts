/**
 * Where the labels of vertical chart markers sit, so two markers close together
 * (your pre-shift and the best one, a few tenths of a nanometre apart) never
 * print their names on top of each other.
 *
 * A marker's label runs along its line, at the top end or the bottom end. Two
 * labels at the same end collide when their lines are closer than a label's
 * height; at opposite ends they never meet (a chart is taller than two labels).
 * So markers are taken in order of value, and each one close to a marker already
 * placed goes to the end that neighbour left free.
 */

export type MarkerLabelPosition = 'insideEndTop' | 'insideStartTop';

/**
 * Closer than this share of the axis, two labels at one end would overlap: a
 * 10 px label's height is about 4 % of a 300 px plot (a 390 px phone), and the
 * margin covers the backing and the line's own width.
 */
export const NEAR_SHARE = 0.08;

/** One position a value, in the order given. `span` is the axis' shown range (max − min). */
export function markerLabelPositions(values: readonly number[], span: number): MarkerLabelPosition[] {
  const near = Math.abs(span) * NEAR_SHARE;
  const order = values.map((v, i) => ({ v, i })).sort((a, b) => a.v - b.v || a.i - b.i);
  const out: MarkerLabelPosition[] = new Array(values.length);
  const placed: { v: number; end: MarkerLabelPosition }[] = [];
  for (const { v, i } of order) {
    const taken = new Set(placed.filter((p) => Math.abs(p.v - v) < near || !(near > 0)).map((p) => p.end));
    const end: MarkerLabelPosition = !taken.has('insideEndTop') ? 'insideEndTop' : !taken.has('insideStartTop') ? 'insideStartTop' : 'insideEndTop';
    out[i] = end;
    placed.push({ v, end });
  }
  return out;
}
