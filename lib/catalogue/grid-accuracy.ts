/**
 * Measured accuracy of the fitness grid against the engine's exact line
 * throughput, over every verified demo curve and line (tests/unit/catalogue/
 * fitness-grid.test.ts measures it again on every run). The search shows exact
 * values for the page; these bounds are what the filter and the throughput sort
 * can be off by.
 */
export const GRID_ERROR = {
  /** On axis, each curve at its own n_eff (fitted, else 2.0). */
  axis: 0.004,
  /** On axis, a named n_eff. */
  neff: 0.006,
  /** Off axis (field angle up to 25°), each curve at its own n_eff. */
  field: 0.01,
  /** The largest of the three. */
  max: 0.01,
} as const;
