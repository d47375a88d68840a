import { withErrors } from '@/lib/http/errors';
import { currentActor } from '@/lib/auth/actor';
import { parseCurveId } from '@/lib/catalogue/detail';
import { publicOrigin } from '@/lib/http/site';
import { loadCurveRecord } from '@/lib/catalogue/formats/load';
import { toVotable } from '@/lib/catalogue/formats/votable';

type Ctx = { params: Promise<{ id: string }> };

// The curve and its metadata as an IVOA VOTable 1.4 (astropy, TOPCAT); readable curves only.
export const GET = withErrors(async (req: Request, ctx: Ctx) => {
  const id = parseCurveId((await ctx.params).id);
  const record = await loadCurveRecord(await currentActor(req), id, publicOrigin(new URL(req.url).origin));
  return new Response(toVotable(record), {
    headers: { 'content-type': 'application/x-votable+xml; charset=utf-8', 'content-disposition': `attachment; filename="bandcone-curve-${id}.vot"` },
  });
});
