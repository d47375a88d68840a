import 'server-only';
import type { Actor } from '@/lib/auth/actor';
import { loadReadableSamples } from '@/lib/catalogue/points';
import { fieldMap, type ChiefRaySpec, type FieldMapResult } from '@/lib/engine/field-map';
import { unprocessable } from '@/lib/http/errors';
import { findVisibleOptic } from '@/lib/optics/store';
import type { FieldMapRequest } from '@/lib/schemas/field-map';

/** Aspect ratio assumed when a saved optic gives only the sensor diagonal (common practice: most camera sensors are 3 : 2). */
export const ASSUMED_ASPECT = 1.5;
/** Decimals kept in the grid: a 200 × 150 map stays near 250 kB of JSON. */
const GRID_DECIMALS = 5;

export async function runFieldMap(actor: Actor | null, body: FieldMapRequest): Promise<FieldMapResult> {
  const notes: string[] = [];
  let points = body.points;
  let measuredAoiDeg = body.measuredAoiDeg;
  if (body.curveId !== undefined) {
    const curve = await loadReadableSamples(actor, body.curveId);
    points = curve.points;
    measuredAoiDeg ??= curve.aoiDeg;
  }

  let optic = body.optic;
  let sensor = body.sensor;
  let exitPupilMm = body.exitPupilMm;
  if (body.opticId !== undefined) {
    const saved = await findVisibleOptic(actor, body.opticId);
    optic = { fNumber: saved.fNumber, obstruction: saved.obstruction };
    if (exitPupilMm === undefined && body.cornerAngleDeg === undefined && body.chiefRayTable === undefined && saved.exitPupilDistanceMm != null) {
      exitPupilMm = saved.exitPupilDistanceMm;
      notes.push(`The exit-pupil distance ${saved.exitPupilDistanceMm} mm comes from the saved optic "${saved.name}".`);
    }
    if (!sensor && saved.sensorDiagonalMm != null) {
      const d = saved.sensorDiagonalMm;
      const k = Math.hypot(ASSUMED_ASPECT, 1);
      sensor = { widthMm: (d * ASSUMED_ASPECT) / k, heightMm: d / k };
      notes.push(`The saved optic gives only the sensor diagonal (${d} mm); a 3 : 2 sensor of ${sensor.widthMm.toFixed(2)} × ${sensor.heightMm.toFixed(2)} mm is assumed.`);
    }
  }
  if (!sensor) throw unprocessable('Give the sensor size (sensor.widthMm and sensor.heightMm), or a saved optic with a sensor diagonal.', [{ field: 'sensor', message: 'the sensor size is required' }]);

  let chiefRay: ChiefRaySpec;
  if (exitPupilMm !== undefined) chiefRay = { exitPupilMm };
  else if (body.cornerAngleDeg !== undefined) chiefRay = { cornerAngleDeg: body.cornerAngleDeg };
  else if (body.chiefRayTable !== undefined) chiefRay = { table: body.chiefRayTable };
  else {
    throw unprocessable('Give the exit-pupil distance (exitPupilMm), the chief-ray angle at the corner (cornerAngleDeg) or a chief-ray table (chiefRayTable).', [
      { field: 'exitPupilMm', message: 'one of exitPupilMm, cornerAngleDeg or chiefRayTable is required' },
    ]);
  }

  const result = fieldMap({
    points: points!,
    optic: optic!,
    sensor,
    chiefRay,
    nEff: body.nEff,
    measuredAoiDeg,
    preShiftNm: body.preShiftNm,
    lineNm: body.lineNm,
    grid: body.grid,
    thresholds: body.thresholds,
  });
  const f = 10 ** GRID_DECIMALS;
  result.grid.throughput = result.grid.throughput.map((row) => row.map((v) => Math.round(v * f) / f));
  result.warnings = [...notes, ...result.warnings];
  return result;
}
