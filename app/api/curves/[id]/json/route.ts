import { withErrors } from '@/lib/http/errors';
import { currentActor } from '@/lib/auth/actor';
import { getCurveDetail, parseCurveId, publicOrigin } from '@/lib/catalogue/detail';
import { loadReadableCurve } from '@/lib/catalogue/points';

type Ctx = { params: Promise<{ id: string }> };

// The JSON download: everything the curve page shows, with the points.
export const GET = withErrors(async (req: Request, ctx: Ctx) => {
  const id = parseCurveId((await ctx.params).id);
  const actor = await currentActor(req);
  const [detail, curve] = await Promise.all([getCurveDetail(actor, id, publicOrigin(new URL(req.url).origin)), loadReadableCurve(actor, id)]);
  const body = JSON.stringify({ ...detail, points: { wavelengthNm: curve.wavelengthNm, transmission: curve.transmission } }, null, 1);
  return new Response(body, {
    headers: {
      'content-type': 'application/json; charset=utf-8',
      'content-disposition': `attachment; filename="bandcone-curve-${id}.json"`,
    },
  });
});
