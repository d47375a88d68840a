/**
 * Angles and the angle scale, in one place (docs/model.md §Angle shift). A ray
 * at incidence θ sees a thin-film passband scaled by
 *   s(θ) = sqrt(1 − sin²θ / n_eff²),
 * the first-order effective-index result: T_θ(λ) = T_0(λ / s(θ)).
 * Angles are degrees at the engine's boundary and radians inside.
 */

/** Radians per degree. */
export const DEG = Math.PI / 180;

/**
 * s from sin²θ and 1/n² (given inverted so a loop over many angles divides
 * once): sqrt(1 − sin²θ · (1/n²)).
 */
export function angleScaleOfSin2(sin2: number, invN2: number): number {
  return Math.sqrt(1 - sin2 * invN2);
}

/** s(θ) = sqrt(1 − sin²θ / n²), θ in degrees. */
export function angleScale(thetaDeg: number, nEff: number): number {
  const s = Math.sin(thetaDeg * DEG);
  return angleScaleOfSin2(s * s, 1 / (nEff * nEff));
}

/**
 * s(θ) as SQL, for a θ in degrees that an SQL expression gives (PostgreSQL's sin and radians),
 * and an n_eff given as a number or as an SQL expression of its own.
 */
export function angleScaleSql(thetaDegSql: string, nEff: number | string): string {
  if (typeof nEff === 'string') return `sqrt(1 - sin(radians(${thetaDegSql}))^2 / (${nEff})^2)`;
  return `sqrt(1 - sin(radians(${thetaDegSql}))^2 * ${(1 / (nEff * nEff)).toPrecision(15)})`;
}
