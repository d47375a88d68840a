/**
 * Largest-triangle-three-buckets downsampling (Steinarsson, 2013). Chosen over plain
 * decimation because a 2 nm passband in a 400–800 nm scan is a handful of samples:
 * striding would often step over the peak, while LTTB keeps the points that carry
 * the shape.
 */
export function downsampleLttb(
  x: readonly number[],
  y: readonly number[],
  target: number,
): { x: number[]; y: number[] } {
  const n = Math.min(x.length, y.length);
  if (target >= n || target < 3) return { x: x.slice(0, n), y: y.slice(0, n) };

  const outX: number[] = [x[0]];
  const outY: number[] = [y[0]];
  const every = (n - 2) / (target - 2);
  let a = 0;

  for (let i = 0; i < target - 2; i++) {
    // Average of the next bucket: the third corner of the triangle.
    const nextStart = Math.floor((i + 1) * every) + 1;
    const nextEnd = Math.min(Math.floor((i + 2) * every) + 1, n);
    let avgX = 0;
    let avgY = 0;
    for (let j = nextStart; j < nextEnd; j++) {
      avgX += x[j];
      avgY += y[j];
    }
    const count = Math.max(1, nextEnd - nextStart);
    avgX /= count;
    avgY /= count;

    const start = Math.floor(i * every) + 1;
    const end = Math.floor((i + 1) * every) + 1;
    let best = start;
    let bestArea = -1;
    for (let j = start; j < end; j++) {
      const area = Math.abs((x[a] - avgX) * (y[j] - y[a]) - (x[a] - x[j]) * (avgY - y[a]));
      if (area > bestArea) {
        bestArea = area;
        best = j;
      }
    }
    outX.push(x[best]);
    outY.push(y[best]);
    a = best;
  }

  outX.push(x[n - 1]);
  outY.push(y[n - 1]);
  return { x: outX, y: outY };
}

/** Drops samples whose x or y is not a finite number, keeping the pairs aligned. */
export function finitePairs(x: readonly number[], y: readonly number[]): { x: number[]; y: number[] } {
  const n = Math.min(x.length, y.length);
  const ox: number[] = [];
  const oy: number[] = [];
  for (let i = 0; i < n; i++) {
    if (Number.isFinite(x[i]) && Number.isFinite(y[i])) {
      ox.push(x[i]);
      oy.push(y[i]);
    }
  }
  return { x: ox, y: oy };
}
