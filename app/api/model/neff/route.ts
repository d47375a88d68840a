import { NextResponse } from 'next/server';
import { withErrors, readJson, unprocessable } from '@/lib/http/errors';
import { neffRequestSchema } from '@/lib/schemas/model';
import { fitEffectiveIndex, type NeffAnswer } from '@/lib/engine/neff';
import { currentActor } from '@/lib/auth/actor';
import { loadReadableCurve } from '@/lib/catalogue/points';

export const POST = withErrors(async (req: Request) => {
  const body = neffRequestSchema.parse(await readJson(req));
  let measurements = body.measurements;
  if (body.curveIds) {
    const actor = await currentActor(req);
    const curves = await Promise.all(body.curveIds.map((id) => loadReadableCurve(actor, id, false)));
    const undefinedCwl = curves.find((c) => c.cwlNm === null);
    if (undefinedCwl) throw unprocessable(`Curve ${undefinedCwl.id} has no CWL (its passband has no half-maximum crossing on one side).`);
    measurements = curves.map((c) => ({ aoiDeg: c.aoiDeg, cwlNm: c.cwlNm as number }));
  }
  const fit = fitEffectiveIndex(measurements!);
  return NextResponse.json<NeffAnswer>({ nEff: fit.nEff, cwl0Nm: fit.cwl0Nm, rmsResidualNm: fit.rmsResidualNm });
});
