import { NextResponse } from 'next/server';
import { withErrors, readJson } from '@/lib/http/errors';
import { POINTS_BODY_MAX } from '@/lib/http/body';
import { coneRequestSchema } from '@/lib/schemas/model';
import { runConeModel } from '@/lib/engine/cone-study';
import { currentActor } from '@/lib/auth/actor';
import { loadReadableSamples } from '@/lib/catalogue/points';
import { resolveSkyReference } from '@/lib/model/sky';
import { wavelengthUncertaintyOf } from '@/lib/engine/quality';

export const POST = withErrors(async (req: Request) => {
  const body = coneRequestSchema.parse(await readJson(req, POINTS_BODY_MAX));
  let points = body.points;
  let measuredAoiDeg = body.measuredAoiDeg;
  let wavelengthUncertaintyNm = body.wavelengthUncertaintyNm;
  if (body.curveId !== undefined) {
    const curve = await loadReadableSamples(await currentActor(req), body.curveId);
    points = curve.points;
    // A stored curve knows the angle it was measured at.
    measuredAoiDeg ??= curve.aoiDeg;
    // and how sure its wavelength scale is: declared, else the default for its instrument kind
    wavelengthUncertaintyNm ??= wavelengthUncertaintyOf(curve.method).nm;
  }
  const { curveId: _ignored, sky: skyBody, ...rest } = body;
  const sky = skyBody ? await resolveSkyReference(req, skyBody) : undefined;
  return NextResponse.json(runConeModel({ ...rest, measuredAoiDeg, wavelengthUncertaintyNm, points: points!, sky }));
});
