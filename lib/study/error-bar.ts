/** The verdict's marks (lib/study/verdict.ts toneOf: 80 % keeps most of the line, 50 % a fair part). */
export const VERDICT_MARKS = [0.8, 0.5];

/** The verdict marks a throughput range lies on both sides of: there the verdict could go either way. */
export function straddledMarks(range: [number, number], marks: number[] = VERDICT_MARKS): number[] {
  const [lo, hi] = range[0] <= range[1] ? range : [range[1], range[0]];
  return marks.filter((m) => lo < m && hi >= m);
}
