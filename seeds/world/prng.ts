/**
 * A small seeded pseudo-random generator (mulberry32) with the few draws the
 * demo world needs. Same seed → same sequence, on every platform.
 */

export interface Rng {
  /** uniform in [0, 1) */
  next(): number;
  /** uniform in [min, max) */
  uniform(min: number, max: number): number;
  /** integer in [min, max] */
  int(min: number, max: number): number;
  /** standard normal draw (Box–Muller) */
  normal(): number;
  pick<T>(items: readonly T[]): T;
  /** true with probability p */
  chance(p: number): boolean;
  /** an independent generator derived from this one and a label */
  fork(label: string): Rng;
}

export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** 32-bit FNV-1a hash of a string, for deriving sub-seeds from labels. */
export function hashString(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

export function createRng(seed: number): Rng {
  const raw = mulberry32(seed);
  let spare: number | null = null;
  const rng: Rng = {
    next: raw,
    uniform: (min, max) => min + (max - min) * raw(),
    int: (min, max) => min + Math.floor(raw() * (max - min + 1)),
    normal: () => {
      if (spare !== null) {
        const s = spare;
        spare = null;
        return s;
      }
      let u = 0;
      while (u <= Number.MIN_VALUE) u = raw();
      const v = raw();
      const r = Math.sqrt(-2 * Math.log(u));
      spare = r * Math.sin(2 * Math.PI * v);
      return r * Math.cos(2 * Math.PI * v);
    },
    pick: (items) => {
      if (items.length === 0) throw new Error('pick from an empty list');
      return items[Math.floor(raw() * items.length)];
    },
    chance: (p) => raw() < p,
    fork: (label) => createRng((hashString(label) ^ Math.imul(seed >>> 0, 0x9e3779b1)) >>> 0),
  };
  return rng;
}
