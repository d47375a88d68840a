/**
 * One curve per physical unit for the unit-to-unit spread and odds of a label.
 * A set measured at several temperatures holds several normal-incidence curves
 * of one unit; counting each would read the unit's temperature drift as a
 * spread between units. Of a set's normal-incidence curves the one measured
 * nearest room temperature (20 °C; a curve with no temperature counts as 20 °C)
 * stands for the unit, the lowest id breaking ties. Curves outside a set are
 * units of their own.
 */
export const UNIT_ATTRIBUTES = ['setKey', 'method'] as const;

const ROOM_C = 20;

export function oneCurvePerUnit<T extends { id: number; setKey: string | null; method: unknown }>(curves: T[]): T[] {
  const best = new Map<string, T>();
  const distance = (c: T) => {
    const t = (c.method as { temperatureC?: unknown } | null)?.temperatureC;
    return typeof t === 'number' && Number.isFinite(t) ? Math.abs(t - ROOM_C) : 0;
  };
  for (const c of curves) {
    if (!c.setKey) continue;
    const held = best.get(c.setKey);
    if (!held || distance(c) < distance(held) || (distance(c) === distance(held) && c.id < held.id)) best.set(c.setKey, c);
  }
  return curves.filter((c) => !c.setKey || best.get(c.setKey) === c);
}
