/**
 * Builds the demo world from the catalogue: one generated measurement per unit,
 * five per unit in a multi-angle curve set, plus public review notes.
 */
import {
  DEMO_NOTICE,
  EXTRAS,
  FILTER_MODELS,
  HOME_LAB,
  INSTRUMENT_STEPS,
  LABS,
  MAKERS,
  MODERATOR_EMAILS,
  OPTICS,
  PEOPLE,
  SET_AOIS_DEG,
  TEMP_SET_C,
  POLARISED_SET_AOIS_DEG,
  TRUE_TEMP_COEFF,
  SUBSTRATES,
  type FilterModel,
  type UnitSpec,
} from './catalogue';
import { createRng, type Rng } from './prng';
import { angleScale, applyAngle, multiCavityPassband, roundTo, wavelengthGrid } from './shapes';
import type {
  CurvePoints,
  DemoCurve,
  DemoCurveSet,
  Polarization,
  DemoLab,
  DemoMethod,
  DemoReview,
  DemoWorld,
  Instrument,
  PassbandBand,
} from './types';

export const DEFAULT_SEED = 20261202;

const MIN_POINTS = 300;
const MAX_POINTS = 2000;
/** half-width of the sampled range in FWHMs, at least */
const RANGE_FWHMS = 6;

// ---------------------------------------------------------------- dates
const DAY_MS = 86_400_000;
const EPOCH = Date.UTC(2024, 0, 8);
const LAST_VERIFIED_MEASURE = Date.UTC(2026, 9, 20);
const FIRST_QUEUE_MEASURE = Date.UTC(2026, 9, 1);
const LAST_QUEUE_MEASURE = Date.UTC(2026, 10, 25);
const LAST_REVIEW = Date.UTC(2026, 10, 30);

function isoDay(ms: number): string {
  return new Date(ms).toISOString().slice(0, 10);
}
function dayMs(iso: string): number {
  return Date.parse(`${iso}T00:00:00Z`);
}
function randomDay(rng: Rng, fromMs: number, toMs: number): string {
  const days = Math.floor((toMs - fromMs) / DAY_MS);
  return isoDay(fromMs + rng.int(0, days) * DAY_MS);
}

// ---------------------------------------------------------------- sampling
interface Sampling {
  startNm: number;
  stepNm: number;
  count: number;
}

function chooseSampling(rng: Rng, instrument: Instrument, loNm: number, hiNm: number, minFwhmNm: number, wide: boolean): Sampling {
  if (wide && loNm >= 400 && hiNm <= 800) return { startNm: 400, stepNm: 0.5, count: 801 };
  const span = hiNm - loNm;
  const fits = (step: number) => step <= minFwhmNm / 10 + 1e-9 && span / step <= MAX_POINTS - 1;
  let steps = INSTRUMENT_STEPS[instrument].filter(fits);
  if (steps.length === 0) steps = [0.05, 0.1, 0.2, 0.25, 0.5].filter(fits);
  if (steps.length === 0) steps = [0.5];
  const stepNm = rng.pick(steps);
  let lo = loNm;
  let hi = hiNm;
  if (span / stepNm < MIN_POINTS) {
    const extra = (MIN_POINTS * stepNm - span) / 2 + stepNm;
    lo -= extra;
    hi += extra;
  }
  const startNm = roundTo(Math.floor(lo / stepNm) * stepNm, 3);
  const count = Math.ceil((hi - startNm) / stepNm) + 1;
  return { startNm, stepNm, count };
}

// ---------------------------------------------------------------- one measurement
interface UnitTruth {
  bands: PassbandBand[];
  nEff: number;
  rippleAmplitude: number;
  ripplePeriodNm: number;
  ripplePhase: number;
  blockingFloor: number;
}

/**
 * Sample the unit at an AOI: the closed form is evaluated at the pre-image
 * wavelengths λ/s, then applyAngle carries each sample to λ exactly; Gaussian
 * noise is added, values clamped to [0, 1] and rounded to 5 decimals.
 */
function measure(rng: Rng, unit: UnitTruth, aoiDeg: number, sampling: Sampling, noiseSigma: number): CurvePoints {
  const grid = wavelengthGrid(sampling.startNm, sampling.stepNm, sampling.count);
  const s = angleScale(aoiDeg, unit.nEff);
  const shape = multiCavityPassband({
    bands: unit.bands,
    rippleAmplitude: unit.rippleAmplitude,
    ripplePeriodNm: unit.ripplePeriodNm,
    ripplePhase: unit.ripplePhase,
    blockingFloor: unit.blockingFloor,
  });
  const preImage = grid.map((l) => l / s);
  const atNormal: CurvePoints = { wavelengthNm: preImage, transmission: preImage.map(shape) };
  const atAoi = applyAngle(atNormal, aoiDeg, unit.nEff);
  return {
    wavelengthNm: atAoi.wavelengthNm.map((l) => roundTo(l, 3)),
    transmission: atAoi.transmission.map((t) => {
      const noisy = roundTo(t + noiseSigma * rng.normal(), 5);
      return Math.min(1, Math.max(0, noisy)) + 0;
    }),
  };
}

function bandsAt(bands: PassbandBand[], s: number): PassbandBand[] {
  return bands.map((b) => ({ ...b, cwlNm: b.cwlNm * s, fwhmNm: b.fwhmNm * s }));
}

// ---------------------------------------------------------------- method
function chooseLab(rng: Rng, contributorEmail: string, needAngleStage: boolean): DemoLab {
  const home = LABS.find((l) => l.name === HOME_LAB[contributorEmail]);
  if (needAngleStage) {
    if (home?.angleStage) return home;
    return rng.pick(LABS.filter((l) => l.angleStage));
  }
  if (home && rng.chance(0.8)) return home;
  return rng.pick(LABS);
}

function declaredResolution(rng: Rng, instrument: Instrument, stepNm: number, minFwhmNm: number): number {
  // a declared resolution is a round figure, never finer than the step nor coarser than FWHM/4
  const preferred: Record<Instrument, number[]> = {
    spectrograph: [0.1, 0.2],
    spectrophotometer: [0.2, 0.5, 1.0],
    monochromator: [0.2, 0.25, 0.5],
    other: [0.5],
  };
  const ok = preferred[instrument].filter((r) => r >= stepNm - 1e-9 && r <= minFwhmNm / 4 + 1e-9);
  return ok.length > 0 ? rng.pick(ok) : stepNm;
}

// ---------------------------------------------------------------- notes
function curveNotes(rng: Rng, model: FilterModel, unit: UnitTruth, extra: string[]): string {
  const design = unit.bands.length > 1 ? `${model.cavities}-cavity stack per band` : `${model.cavities}-cavity design`;
  const parts = [`${model.coating}, ${design}`];
  parts.push(rng.pick(SUBSTRATES));
  if (rng.chance(0.5)) parts.push(rng.pick(EXTRAS));
  if (model.declaredPreShiftNm !== undefined) {
    parts.push(`maker states a ${model.declaredPreShiftNm} nm pre-shift for fast optics (roughly f/1.8 to f/3.5)`);
  }
  if (model.bands.length > 1) {
    const second = model.bands[1];
    parts.push(`second passband ${second.cwlNm} nm / ${second.fwhmNm} nm`);
  }
  parts.push(...extra);
  return `${parts.join('; ')}. Invented maker, generated curve (demo).`;
}

// ---------------------------------------------------------------- reviews
const VERIFY_NOTES = [
  (c: DemoCurve) => `Method and data agree; the half-maximum width matches the declared ${c.nominalFwhmNm} nm passband.`,
  (c: DemoCurve) => `Checked against the declared ${c.method.instrument} method; range and step suit a ${c.nominalFwhmNm} nm filter.`,
  () => 'Clean scan; noise and blocking floor are what the declared bench should give.',
  (c: DemoCurve) => `Verified; the ${c.generated.stepNm} nm step resolves the passband edges well.`,
  () => 'Consistent with the other units of this label; verified.',
  () => 'AOI, beam and temperature fields checked against the notes; verified.',
];

function reviewNote(rng: Rng, curve: DemoCurve): string {
  const nominal = curve.nominalCwlNm;
  const measured = curve.generated.bandsAtAoi[0].cwlNm;
  if (curve.generated.anomaly) {
    const off = measured - nominal;
    return `Verified as measured: this unit sits ${Math.abs(off).toFixed(1)} nm ${off > 0 ? 'red' : 'blue'} of the catalogue CWL, a property of the unit rather than an error.`;
  }
  if (curve.trueTempCoeffNmPerC !== undefined) {
    return 'Temperature series verified: the passband moves redward with temperature by about what the declared coating leads one to expect.';
  }
  if (curve.trueNEffPolarised) {
    return 'Polarised angle series verified: s and p light split off normal incidence as a thin-film cavity should.';
  }
  if (curve.setKey) {
    return 'Angle series verified: the passband moves blueward from 0° to 16° as the effective-index model expects.';
  }
  if (curve.method.aoiDeg !== 0) {
    return `Verified; measured at AOI ${curve.method.aoiDeg}°, which the model corrects to normal incidence.`;
  }
  if (curve.lines.length > 1 && curve.generated.bands.length > 1) {
    return 'Both passbands present and within the declared widths; verified.';
  }
  return rng.pick(VERIFY_NOTES)(curve);
}

// ---------------------------------------------------------------- world
function serialFor(rng: Rng, prefix: string, taken: Set<string>): string {
  for (;;) {
    const serial = `${prefix}-${rng.int(21, 26)}-${String(rng.int(0, 99_999)).padStart(5, '0')}`;
    if (!taken.has(serial)) {
      taken.add(serial);
      return serial;
    }
  }
}

const CONTRIBUTOR_EMAILS = PEOPLE.filter((p) => p.role === 'contributor').map((p) => p.email);

export function buildDemoWorld(seed: number = DEFAULT_SEED): DemoWorld {
  const root = createRng(seed);
  const serials = new Set<string>();
  const curves: DemoCurve[] = [];
  const sets: DemoCurveSet[] = [];
  const reviews: DemoReview[] = [];

  for (const model of FILTER_MODELS) {
    // Each model gets its own stream so editing one model leaves the others unchanged.
    const rng = root.fork(model.id);
    // the catalogue is a little off for every unit of a label
    const labelCwlBias = rng.uniform(-0.15, 0.15);
    const labelFwhmBias = rng.uniform(-0.03, 0.03);

    model.units.forEach((spec: UnitSpec, index) => {
      const status = spec.status ?? 'verified';
      const unitKey = `${model.id}-u${index + 1}`;
      const contributorEmail = spec.contributorEmail ?? rng.pick(CONTRIBUTOR_EMAILS);
      const nEff = roundTo(rng.uniform(1.7, 2.1), 3);
      const multiBand = model.bands.length > 1;
      const bands: PassbandBand[] = model.bands.map((b, i) => {
        const spread = rng.uniform(-0.3, 0.3);
        // a deliberately off unit sits exactly cwlOffsetNm from the catalogue, so the checks have a clear case
        const offset = i === 0 && spec.cwlOffsetNm !== undefined ? spec.cwlOffsetNm : labelCwlBias + spread;
        const fwhm = b.fwhmNm * (1 + labelFwhmBias) * (1 + rng.uniform(-0.05, 0.05));
        const peak = Math.min(0.97, Math.max(0.8, b.peakT + rng.uniform(-0.012, 0.012)));
        return { cwlNm: roundTo(b.cwlNm + offset, 4), fwhmNm: roundTo(fwhm, 4), peakT: roundTo(peak, 4), cavities: model.cavities };
      });
      if (multiBand) {
        // keep the primary passband clearly the highest, so the global maximum sits in it
        for (let i = 1; i < bands.length; i++) bands[i].peakT = Math.min(bands[i].peakT, roundTo(bands[0].peakT - 0.06, 4));
      }
      const unit: UnitTruth = {
        bands,
        nEff,
        rippleAmplitude: roundTo(rng.uniform(0.005, multiBand ? 0.012 : 0.02), 4),
        ripplePeriodNm: roundTo(Math.min(...bands.map((b) => b.fwhmNm)) * rng.uniform(0.3, 0.6), 3),
        ripplePhase: rng.uniform(0, 2 * Math.PI),
        blockingFloor: roundTo(10 ** rng.uniform(-4, -3), 6),
      };
      const serial = serialFor(rng, model.serialPrefix, serials);
      const sizeMm = rng.pick(model.sizesMm);
      const licence = rng.chance(0.8) ? 'CC-BY-4.0' : 'CC0-1.0';
      // a polarised set measures 0° once and every other angle in s and in p; a temperature set stays at 0°
      const aois: number[] = spec.angleSet
        ? [...SET_AOIS_DEG]
        : spec.polarisedSet
          ? POLARISED_SET_AOIS_DEG.flatMap((a) => (a === 0 ? [a] : [a, a]))
          : spec.tempSet
            ? TEMP_SET_C.map(() => 0)
            : [spec.aoiDeg ?? 0];
      const polAt = (step: number): Polarization | undefined => (spec.polarisedSet ? (aois[step] === 0 ? 'unpolarized' : step % 2 === 1 ? 's' : 'p') : undefined);
      // truth of a polarised set: s and p indices either side of the unit's (high-index spacer: n_eff,p < n_eff,s)
      const nEffPolarised = spec.polarisedSet ? { s: roundTo(nEff + 0.03, 3), p: roundTo(nEff - 0.03, 3) } : undefined;
      const tempCoeff = TRUE_TEMP_COEFF[model.coatingType];
      const maxAoi = Math.max(...aois);
      const sMin = angleScale(maxAoi, Math.min(nEff, nEffPolarised?.p ?? nEff));

      const lab = chooseLab(rng, contributorEmail, aois.length > 1 || maxAoi > 0);
      const instrument: Instrument = aois.length > 1 ? (lab.instruments.includes('spectrophotometer') ? 'spectrophotometer' : lab.instruments[0]) : rng.pick(lab.instruments);
      const minFwhm = Math.min(...bands.map((b) => b.fwhmNm)) * sMin;
      const margin = rng.uniform(1, 8);
      const lo = Math.min(...bands.map((b) => b.cwlNm * sMin - RANGE_FWHMS * b.fwhmNm)) - margin;
      const hi = Math.max(...bands.map((b) => b.cwlNm + RANGE_FWHMS * b.fwhmNm)) + margin;
      const sampling = chooseSampling(rng, instrument, lo, hi, minFwhm, spec.wideScan === true);
      const resolutionNm = spec.resolutionNm ?? declaredResolution(rng, instrument, sampling.stepNm, minFwhm);
      const noiseSigma = roundTo(rng.uniform(0.001, 0.004), 4);

      const converging = aois.length === 1 && maxAoi === 0 && instrument === 'spectrograph' && rng.chance(0.4);
      const indoor = lab.kind !== 'observatory';
      const temperatureC = rng.chance(0.75) ? roundTo(indoor ? rng.uniform(19, 24) : rng.uniform(6, 16), 1) : undefined;

      const measuredOn =
        status === 'verified'
          ? randomDay(rng, EPOCH, LAST_VERIFIED_MEASURE)
          : randomDay(rng, FIRST_QUEUE_MEASURE, LAST_QUEUE_MEASURE);

      const setKey = spec.angleSet ? `${unitKey}-set` : spec.tempSet ? `${unitKey}-tset` : spec.polarisedSet ? `${unitKey}-pset` : undefined;
      const unitExtra: string[] = [];
      if (spec.angleSet) unitExtra.push('measured on a rotation stage in a collimated beam at 0, 4, 8, 12 and 16°');
      else if (spec.tempSet) unitExtra.push(`measured at normal incidence in a heated holder at ${TEMP_SET_C.join(', ')} °C`);
      else if (spec.polarisedSet) unitExtra.push('measured on a rotation stage through a polariser, in s and in p light at 8 and 16°');
      else if (maxAoi > 0) unitExtra.push(`measured tilted at ${maxAoi}° in the holder`);
      const notes = curveNotes(rng, model, unit, unitExtra);
      const polarization = aois.length > 1 || maxAoi > 0 ? 'unpolarized' : rng.pick(['unpolarized', 'unpolarized', undefined] as const);

      // one submission per unit (a set is one submission), so one review decision and date for all its curves
      const measuredDays = (step: number) => Math.floor(step / 3);
      const lastMeasuredMs = dayMs(measuredOn) + measuredDays(aois.length - 1) * DAY_MS;
      const reviewer = rng.pick(MODERATOR_EMAILS);
      const reviewedOn = isoDay(Math.max(Math.min(LAST_REVIEW, lastMeasuredMs + rng.int(3, 40) * DAY_MS), lastMeasuredMs + DAY_MS));

      const curveKeys: string[] = [];
      aois.forEach((aoiDeg, step) => {
        const pol = polAt(step);
        const tempAt = spec.tempSet ? TEMP_SET_C[step] : temperatureC;
        const key = spec.angleSet
          ? `${unitKey}-aoi${String(aoiDeg).padStart(2, '0')}`
          : spec.tempSet
            ? `${unitKey}-t${String(tempAt).padStart(2, '0')}`
            : spec.polarisedSet
              ? `${unitKey}-aoi${String(aoiDeg).padStart(2, '0')}${aoiDeg === 0 ? '' : `-${pol}`}`
              : unitKey;
        // this take's truth: its own light's index, and the passband moved by the temperature (from 20 °C)
        const takeNEff = nEffPolarised && (pol === 's' || pol === 'p') ? nEffPolarised[pol] : nEff;
        const warm = spec.tempSet ? tempCoeff * (TEMP_SET_C[step] - 20) : 0;
        const takeUnit: UnitTruth = { ...unit, nEff: takeNEff, bands: warm ? bands.map((b) => ({ ...b, cwlNm: roundTo(b.cwlNm + warm, 4) })) : bands };
        const s = angleScale(aoiDeg, takeNEff);
        const method: DemoMethod = {
          instrument,
          resolutionNm,
          beam: converging ? 'converging' : 'collimated',
          ...(converging ? { beamFNumber: rng.pick([15, 18, 20]) } : {}),
          aoiDeg,
          ...(tempAt !== undefined ? { temperatureC: tempAt } : {}),
          ...(pol ? { polarization: pol } : polarization ? { polarization } : {}),
          coating: model.coatingType,
          measuredOn: isoDay(dayMs(measuredOn) + measuredDays(step) * DAY_MS),
          lab: lab.name,
        };
        const curve: DemoCurve = {
          key,
          label: model.label,
          makerName: model.makerName,
          lines: [...model.lines],
          nominalCwlNm: model.bands[0].cwlNm,
          nominalFwhmNm: model.bands[0].fwhmNm,
          ...(model.declaredPreShiftNm !== undefined ? { declaredPreShiftNm: model.declaredPreShiftNm } : {}),
          serial,
          sizeMm,
          notes,
          licence,
          contributorEmail,
          method,
          ...(setKey ? { setKey, trueNEff: nEff } : {}),
          ...(spec.tempSet ? { trueTempCoeffNmPerC: tempCoeff } : {}),
          ...(nEffPolarised ? { trueNEffPolarised: nEffPolarised } : {}),
          status,
          points: measure(rng, takeUnit, aoiDeg, sampling, noiseSigma),
          generated: {
            bands: bands.map((b) => ({ ...b })),
            bandsAtAoi: bandsAt(takeUnit.bands, s),
            nEff: takeNEff,
            rippleAmplitude: unit.rippleAmplitude,
            ripplePeriodNm: unit.ripplePeriodNm,
            blockingFloor: unit.blockingFloor,
            noiseSigma,
            stepNm: sampling.stepNm,
            ...(spec.anomaly ? { anomaly: spec.anomaly } : {}),
          },
        };
        curves.push(curve);
        curveKeys.push(key);

        if (status !== 'submitted') {
          reviews.push({
            curveKey: key,
            moderatorEmail: reviewer,
            decision: status === 'verified' ? 'verify' : 'request_changes',
            note: status === 'verified' ? reviewNote(rng, curve) : spec.changesNote ?? 'Please check the method fields against the data.',
            reviewedOn,
          });
        }
      });

      if (setKey && spec.angleSet) {
        sets.push({
          key: setKey,
          label: model.label,
          makerName: model.makerName,
          serial,
          contributorEmail,
          trueNEff: nEff,
          cwl0Nm: bands[0].cwlNm,
          aoisDeg: aois,
          curveKeys,
        });
      }
    });
  }

  return {
    seed,
    notice: DEMO_NOTICE,
    people: PEOPLE.map((p) => ({ ...p })),
    makers: MAKERS.map((m) => ({ ...m })),
    labs: LABS.map((l) => ({ ...l, instruments: [...l.instruments] })),
    optics: OPTICS.map((o) => ({ ...o })),
    curves,
    sets,
    reviews,
  };
}
