'use client';

import { useDeferredValue, useMemo, useState } from 'react';
import { HeatmapChart } from '@/components/charts/heatmap-chart';
import { formatDeg, formatTransmission, fixed } from '@/components/charts/format';
import { Field, inputClass } from '@/components/forms/field';
import { fieldMap, type ChiefRaySpec, type FieldMapResult } from '@/lib/engine/field-map';
import type { CurveStudy, StudySettings } from '@/lib/study/types';

/** Common sensor formats, mm (common practice, nominal sizes). */
const SENSORS = [
  { name: 'APS-C', widthMm: 23.5, heightMm: 15.6 },
  { name: 'Full frame', widthMm: 36, heightMm: 24 },
  { name: 'Four Thirds', widthMm: 17.3, heightMm: 13 },
  { name: '1-inch type', widthMm: 13.2, heightMm: 8.8 },
];

type Mode = 'exitPupil' | 'corner';

/**
 * The whole sensor: line throughput at every image point for the first curve of
 * the study, computed in the browser by the same engine as POST /api/model/field-map.
 */
export function SensorMap({ studies, settings }: { studies: CurveStudy[]; settings: StudySettings }) {
  const [widthMm, setWidth] = useState('23.5');
  const [heightMm, setHeight] = useState('15.6');
  const [mode, setMode] = useState<Mode>(settings.optic.fieldAngleDeg > 0 ? 'corner' : 'exitPupil');
  const [exitPupilMm, setExitPupil] = useState('60');
  const [cornerDeg, setCorner] = useState(settings.optic.fieldAngleDeg > 0 ? String(settings.optic.fieldAngleDeg) : '10');
  const [keepPct, setKeep] = useState('80');
  const [which, setWhich] = useState(0);
  const study = studies[Math.min(which, studies.length - 1)];

  const inputs = useDeferredValue({ widthMm, heightMm, mode, exitPupilMm, cornerDeg, keepPct });
  const outcome = useMemo((): { map: FieldMapResult } | { error: string } | null => {
    if (!study) return null;
    const w = Number(inputs.widthMm);
    const h = Number(inputs.heightMm);
    const keep = Number(inputs.keepPct) / 100;
    const chiefRay: ChiefRaySpec = inputs.mode === 'exitPupil' ? { exitPupilMm: Number(inputs.exitPupilMm) } : { cornerAngleDeg: Number(inputs.cornerDeg) };
    try {
      const nx = 72;
      const map = fieldMap({
        points: study.curve.points,
        optic: { fNumber: settings.optic.fNumber, obstruction: settings.optic.obstruction, mapping: settings.optic.mapping },
        sensor: { widthMm: w, heightMm: h },
        chiefRay,
        nEff: study.nEff,
        measuredAoiDeg: study.curve.aoiDeg,
        preShiftNm: study.totalShiftNm,
        lineNm: study.lineNm,
        grid: { nx, ny: Math.max(2, Math.min(400, Math.round((nx * h) / w))) },
        thresholds: [Number.isFinite(keep) && keep >= 0 && keep <= 1 ? keep : 0.8],
      });
      return { map };
    } catch (e) {
      return { error: (e as Error).message };
    }
  }, [study, settings, inputs]);

  if (!study) return null;
  const map = outcome && 'map' in outcome ? outcome.map : null;
  const share = map?.areaAtLeast[0];
  const last = map ? map.profile.chiefRayDeg.length - 1 : 0;

  return (
    <section aria-labelledby="sensor-map-title" className="space-y-3 rounded-card border border-rule bg-panel p-4" data-testid="sensor-map">
      <h2 id="sensor-map-title" className="text-lg font-semibold">
        Across the whole sensor
      </h2>
      <p className="text-sm text-muted">
        Off the axis the chief ray meets the filter at an angle, so the whole cone tilts and the passband moves further to the blue. Choose the sensor and
        how steeply its corners are lit.
      </p>
      <div className="grid grid-cols-2 gap-3 sm:grid-cols-4">
        {studies.length > 1 ? (
          <Field id="sm-curve" label="Curve">
            <select id="sm-curve" className={inputClass} value={which} onChange={(e) => setWhich(Number(e.target.value))}>
              {studies.map((s, i) => (
                <option key={s.curve.key} value={i}>
                  {s.curve.label}
                </option>
              ))}
            </select>
          </Field>
        ) : null}
        <Field id="sm-format" label="Sensor format">
          <select
            id="sm-format"
            className={inputClass}
            value={SENSORS.find((s) => String(s.widthMm) === widthMm && String(s.heightMm) === heightMm)?.name ?? ''}
            onChange={(e) => {
              const s = SENSORS.find((x) => x.name === e.target.value);
              if (s) {
                setWidth(String(s.widthMm));
                setHeight(String(s.heightMm));
              }
            }}
          >
            <option value="">Typed size</option>
            {SENSORS.map((s) => (
              <option key={s.name} value={s.name}>
                {s.name} ({s.widthMm} × {s.heightMm} mm)
              </option>
            ))}
          </select>
        </Field>
        <Field id="sm-width" label="Width" suffix="mm">
          <input id="sm-width" className={inputClass} inputMode="decimal" value={widthMm} onChange={(e) => setWidth(e.target.value)} />
        </Field>
        <Field id="sm-height" label="Height" suffix="mm">
          <input id="sm-height" className={inputClass} inputMode="decimal" value={heightMm} onChange={(e) => setHeight(e.target.value)} />
        </Field>
        <Field id="sm-mode" label="Chief ray from">
          <select id="sm-mode" className={inputClass} value={mode} onChange={(e) => setMode(e.target.value as Mode)}>
            <option value="exitPupil">Exit-pupil distance</option>
            <option value="corner">Angle at the corner</option>
          </select>
        </Field>
        {mode === 'exitPupil' ? (
          <Field id="sm-pupil" label="Exit-pupil distance" suffix="mm">
            <input id="sm-pupil" className={inputClass} inputMode="decimal" value={exitPupilMm} onChange={(e) => setExitPupil(e.target.value)} />
          </Field>
        ) : (
          <Field id="sm-corner" label="Chief ray at the corner" suffix="°">
            <input id="sm-corner" className={inputClass} inputMode="decimal" value={cornerDeg} onChange={(e) => setCorner(e.target.value)} />
          </Field>
        )}
        <Field id="sm-keep" label="Keeps at least" suffix="%">
          <input id="sm-keep" className={inputClass} inputMode="decimal" value={keepPct} onChange={(e) => setKeep(e.target.value)} />
        </Field>
      </div>
      {outcome && 'error' in outcome ? (
        <p role="alert" className="text-sm text-bad">
          {outcome.error}
        </p>
      ) : null}
      {map ? (
        <>
          <dl className="figures grid grid-cols-2 gap-2 text-sm sm:grid-cols-4" data-testid="sensor-map-figures">
            <div>
              <dt className="text-muted">Centre</dt>
              <dd>{formatTransmission(map.centre)}</dd>
            </div>
            <div>
              <dt className="text-muted">Long-edge midpoint</dt>
              <dd>{formatTransmission(map.edgeX)}</dd>
            </div>
            <div>
              <dt className="text-muted">Short-edge midpoint</dt>
              <dd>{formatTransmission(map.edgeY)}</dd>
            </div>
            <div>
              <dt className="text-muted">Corners (worst)</dt>
              <dd>
                {formatTransmission(map.corner)} at {formatDeg(map.profile.chiefRayDeg[last])}
              </dd>
            </div>
          </dl>
          <HeatmapChart
            title={`Line throughput across a ${fixed(Number(widthMm), 1)} × ${fixed(Number(heightMm), 1)} mm sensor`}
            x={map.grid.xMm}
            y={map.grid.yMm}
            values={map.grid.throughput}
            xName="Across the sensor (mm)"
            yName="Up the sensor (mm)"
            xFormat="number"
            yFormat="number"
            valueName="Line throughput"
            aspect={Number(widthMm) / Number(heightMm) || 1.5}
            fileName="sensor-map"
            summary={
              share ? (
                <p>
                  {formatTransmission(share.share)} of the sensor area keeps at least {formatTransmission(share.threshold, 0)} of the line. Each point uses the
                  model at its own chief-ray angle; the map is interpolated from {map.profile.radiusMm.length} exactly computed radii.
                </p>
              ) : null
            }
          />
          {map.warnings.map((w) => (
            <p key={w} className="text-sm text-muted">
              {w}
            </p>
          ))}
        </>
      ) : null}
    </section>
  );
}
