/**
 * The invented demo world (demo data: invented makers, places, people and
 * generated curves). Pure data, deterministic for a seed; no database code.
 */
export { buildDemoWorld, DEFAULT_SEED } from './generate';
export { DEMO_NOTICE, LINE_AIR_NM, OPTICS, PEOPLE, MAKERS, LABS, FILTER_MODELS, SET_AOIS_DEG } from './catalogue';
export { multiCavityPassband, applyAngle, angleScale, roundTo, wavelengthGrid } from './shapes';
export type { PassbandParams } from './shapes';
export { mulberry32, createRng } from './prng';
export type { Rng } from './prng';
export type * from './types';
