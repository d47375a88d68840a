// Loads the invented demo world through the same code paths contributors and
// moderators use, so the demo exercises the real intake, checks and review.
import { buildDemoWorld, DEMO_NOTICE, type DemoCurve } from './world';
import { writeCurveCsv } from '@/lib/engine/csv';
import { db } from '@/db/models';
import { closeSequelize } from '@/db/connection';
import { hashPassword } from '@/lib/auth/password';
import { createSubmission } from '@/moderation/submissions';
import { decide } from '@/moderation/decisions';
import { submissionMetadataSchema } from '@/lib/schemas/submission';

const ifEmpty = process.argv.includes('--if-empty');

function fileFor(curve: DemoCurve) {
  const csv = writeCurveCsv({ label: curve.label, serial: curve.serial, aoi_deg: curve.method.aoiDeg, note: DEMO_NOTICE }, curve.points);
  return { name: `${curve.key}.csv`, bytes: Buffer.from(csv, 'utf8') };
}

function metadataFor(group: DemoCurve[]) {
  const c = group[0];
  return submissionMetadataSchema.parse({
    label: c.label,
    maker: c.makerName,
    lines: c.lines,
    nominalCwlNm: c.nominalCwlNm,
    nominalFwhmNm: c.nominalFwhmNm,
    declaredPreShiftNm: c.declaredPreShiftNm,
    serial: c.serial,
    sizeMm: `${c.sizeMm} mm`,
    notes: c.notes,
    licence: c.licence,
    method: { ...c.method, lab: c.method.lab },
    // each file's own angle, temperature and polarisation: a set at several temperatures or in s and p light
    files:
      group.length > 1
        ? group.map((g) => ({
            name: `${g.key}.csv`,
            aoiDeg: g.method.aoiDeg,
            ...(g.method.temperatureC !== undefined ? { temperatureC: g.method.temperatureC } : {}),
            ...(g.method.polarization ? { polarization: g.method.polarization } : {}),
          }))
        : undefined,
  });
}

async function main() {
  if (process.env.BANDCONE_ENV === 'production') {
    console.log('seeds: production environment, demo world not loaded');
    return;
  }
  const models = db();
  if (ifEmpty && (await models.User.count({ where: { email: 'admin@bandcone.test' } })) > 0) {
    console.log('seeds: demo world already loaded');
    return;
  }
  const started = Date.now();
  const world = buildDemoWorld();
  const passwordHash = await hashPassword(process.env.DEMO_PASSWORD ?? 'bandcone-demo');
  const users = new Map<string, { id: string; role: 'contributor' | 'moderator' | 'admin' }>();
  for (const p of world.people) {
    const [user] = await models.User.findOrCreate({
      where: { email: p.email },
      defaults: { email: p.email, name: p.name, role: p.role, passwordHash, emailVerified: new Date() },
    });
    users.set(p.email, { id: user.id, role: user.role });
  }
  for (const o of world.optics) {
    await models.Optic.findOrCreate({
      where: { name: o.name, isExample: true },
      defaults: { ...o, ownerId: null, isExample: true, reducerFactor: null, sensorDiagonalMm: null, exitPupilDistanceMm: null },
    });
  }
  // A set is one submission of several files; every other curve is a submission of its own.
  const groups = new Map<string, DemoCurve[]>();
  for (const c of world.curves) {
    const key = c.setKey ?? c.key;
    groups.set(key, [...(groups.get(key) ?? []), c]);
  }
  const reviewByCurve = new Map(world.reviews.map((r) => [r.curveKey, r]));
  let verified = 0;
  for (const group of groups.values()) {
    const first = group[0];
    const contributor = users.get(first.contributorEmail)!;
    const result = await createSubmission(contributor, metadataFor(group), group.map(fileFor), { notify: false });
    const review = group.map((c) => reviewByCurve.get(c.key)).find(Boolean);
    const moderator = review ? users.get(review.moderatorEmail) : undefined;
    if (first.status === 'verified' && review && moderator) {
      await decide(moderator, result.id, 'verify', review.note, { notify: false });
      verified += group.length;
    } else if (first.status === 'changes_requested' && review && moderator) {
      await decide(moderator, result.id, 'request_changes', review.note, { notify: false });
    }
  }
  console.log(`seeds: ${world.people.length} people, ${world.optics.length} optics, ${world.curves.length} curves (${verified} verified) in ${((Date.now() - started) / 1000).toFixed(1)} s`);
}

main()
  .then(() => closeSequelize())
  .catch(async (err) => {
    console.error(err);
    await closeSequelize();
    process.exit(1);
  });
