/**
 * Gauss–Legendre nodes on [0, 1]. Computed by Newton iteration on P_n, cached
 * per order; the pupil integrals only ever need a few small orders.
 */

export interface Rule {
  nodes: Float64Array;
  weights: Float64Array;
}

const cache = new Map<number, Rule>();

export function gaussLegendre01(n: number): Rule {
  const hit = cache.get(n);
  if (hit) return hit;
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let x = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let dp = 0;
    for (let iter = 0; iter < 100; iter++) {
      let p0 = 1;
      let p1 = x;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      const pn = n === 1 ? x : p1;
      const pnm1 = n === 1 ? 1 : p0;
      dp = (n * (x * pn - pnm1)) / (x * x - 1);
      const dx = pn / dp;
      x -= dx;
      if (Math.abs(dx) < 1e-16) break;
    }
    // map [-1, 1] → [0, 1]
    nodes[n - 1 - i] = 0.5 * (x + 1);
    weights[n - 1 - i] = 1 / ((1 - x * x) * dp * dp);
  }
  const rule = { nodes, weights };
  cache.set(n, rule);
  return rule;
}
