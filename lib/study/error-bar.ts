/** The verdict's marks (lib/study/verdict.ts toneOf: 80 % keeps most of the line, 50 % a fair part). */
export const VERDICT_MARKS = [0.8, 0.5];

/** The verdict marks a throughput range lies on both sides of: there the verdict could go either way. */
export function straddledMarks(range: [number, number], marks: number[] = VERDICT_MARKS): number[] {
  const [lo, hi] = range[0] <= range[1] ? range : [range[1], range[0]];
  return marks.filter((m) => lo < m && hi >= m);
}

/**
 * The throughput range against the figure the user needs: clears it at its low
 * end, falls short of it at its high end, or straddles it (the measurement
 * cannot tell which).
 */
export function needVerdict(range: [number, number], need: number): { kind: 'clears' | 'short' | 'straddles'; text: string } {
  const [lo, hi] = range[0] <= range[1] ? range : [range[1], range[0]];
  const pct = (v: number) => `${(v * 100).toFixed(v * 100 >= 10 ? 0 : 1)} %`;
  if (lo >= need) return { kind: 'clears', text: `Clears the ${pct(need)} you need even at the low end of its range.` };
  if (hi < need) return { kind: 'short', text: `Falls short of the ${pct(need)} you need even at the high end of its range.` };
  return { kind: 'straddles', text: `The range straddles the ${pct(need)} you need: within this measurement's accuracy it may or may not clear it.` };
}
