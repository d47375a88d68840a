import { describe, expect, it } from 'vitest';
import { fNumberCaption, intervalsAtOrAbove } from '@/lib/study/captions';
import { markerLabelPositions, NEAR_SHARE } from '@/components/charts/marker-labels';

// A pre-shifted filter: too far to the red at f/1 and again at slow f-numbers, right on the
// line between about f/2.1 and f/2.6 (the shape the cone's blue shift gives; docs/model.md §Angle shift).
const x = [1, 1.5, 2, 2.5, 3, 4, 6, 8, 10];
const y = [0.3, 0.6, 0.7, 0.9, 0.7, 0.5, 0.45, 0.44, 0.44];

describe('captions read from the plotted series', () => {
  it('finds every stretch above the level in a non-monotone series, where the straight segments cross it', () => {
    // crossings by hand on the joining segments: 2 + 0.5·(0.8 − 0.7)/(0.9 − 0.7) = 2.25; 2.5 + 0.5·(0.8 − 0.9)/(0.7 − 0.9) = 2.75
    expect(intervalsAtOrAbove(x, y, 0.8)).toEqual([{ from: 2.25, to: 2.75 }]);
    // two stretches, one of them reaching the slow end of the plot
    const twice = [0.9, 0.5, 0.85, 0.85];
    expect(intervalsAtOrAbove([1, 2, 3, 4], twice, 0.8)).toEqual([
      { from: 1, to: 1 + (0.8 - 0.9) / (0.5 - 0.9) },
      { from: 2 + (0.8 - 0.5) / (0.85 - 0.5), to: 4 },
    ]);
    expect(intervalsAtOrAbove(x, y, 0.95)).toEqual([]);
  });

  it('never says "below … even at f/10" when the line rises above the level in the middle', () => {
    const text = fNumberCaption(x, y, 0.8);
    expect(text).toBe('keeps 80 % of the line from f/2.3 to f/2.8, and less elsewhere from f/1.0 to f/10.0');
    expect(text).not.toMatch(/stays below/);
    // and every number it states is a point where the plotted line sits at the level
    for (const m of text.matchAll(/from f\/(\d+\.\d) to f\/(\d+\.\d),/g)) {
      const [a, b] = [Number(m[1]), Number(m[2])];
      const run = intervalsAtOrAbove(x, y, 0.8)[0];
      expect(Math.abs(a - run.from)).toBeLessThanOrEqual(0.05);
      expect(Math.abs(b - run.to)).toBeLessThanOrEqual(0.05);
    }
  });

  it('says below everywhere, or at every f-number, only when the whole line is', () => {
    expect(fNumberCaption(x, y.map((v) => v * 0.5), 0.8)).toBe('stays below 80 % of the line everywhere from f/1.0 to f/10.0');
    expect(fNumberCaption(x, y.map(() => 0.95), 0.8)).toBe('keeps 80 % of the line at every f-number from f/1.0 to f/10.0');
    expect(fNumberCaption([1, 2, 3], [0.5, 0.9, 0.95], 0.8)).toBe('keeps 80 % of the line from f/1.8 to f/3.0, and less elsewhere from f/1.0 to f/3.0');
  });
});

describe('marker labels', () => {
  it('puts two close markers at opposite ends of their lines, and far ones both at the top', () => {
    // yours +1.20 nm and best +1.05 nm on a 3 nm wide pre-shift axis
    expect(markerLabelPositions([1.2, 1.05], 3)).toEqual(['insideStartTop', 'insideEndTop']);
    expect(markerLabelPositions([0, 2.5], 3)).toEqual(['insideEndTop', 'insideEndTop']);
    // the very same value (your pre-shift is the best one) still gives two ends
    expect(markerLabelPositions([0.6, 0.6], 3)).toEqual(['insideEndTop', 'insideStartTop']);
    // a chain: each neighbour closer than NEAR_SHARE takes the end the previous one left free
    const step = 3 * NEAR_SHARE * 0.9;
    expect(markerLabelPositions([0, step, 2 * step], 3)).toEqual(['insideEndTop', 'insideStartTop', 'insideEndTop']);
  });
});
