import { withErrors } from '@/lib/http/errors';
import { currentActor } from '@/lib/auth/actor';
import { getCurveDetailWithPoints, parseCurveId } from '@/lib/catalogue/detail';
import { publicOrigin } from '@/lib/http/site';

type Ctx = { params: Promise<{ id: string }> };

// The JSON download: everything the curve page shows, with the points.
export const GET = withErrors(async (req: Request, ctx: Ctx) => {
  const id = parseCurveId((await ctx.params).id);
  const actor = await currentActor(req);
  const { detail, points } = await getCurveDetailWithPoints(actor, id, publicOrigin(new URL(req.url).origin));
  const body = JSON.stringify({ ...detail, points }, null, 1);
  return new Response(body, {
    headers: {
      'content-type': 'application/json; charset=utf-8',
      'content-disposition': `attachment; filename="bandcone-curve-${id}.json"`,
    },
  });
});
