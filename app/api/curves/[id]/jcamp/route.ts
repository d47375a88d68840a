import { withErrors } from '@/lib/http/errors';
import { currentActor } from '@/lib/auth/actor';
import { parseCurveId } from '@/lib/catalogue/detail';
import { publicOrigin } from '@/lib/http/site';
import { loadCurveRecord } from '@/lib/catalogue/formats/load';
import { toJcamp } from '@/lib/catalogue/formats/jcamp';

type Ctx = { params: Promise<{ id: string }> };

// The curve as JCAMP-DX 4.24 for lab spectroscopy software; readable curves only.
export const GET = withErrors(async (req: Request, ctx: Ctx) => {
  const id = parseCurveId((await ctx.params).id);
  const record = await loadCurveRecord(await currentActor(req), id, publicOrigin(new URL(req.url).origin));
  return new Response(toJcamp(record), {
    headers: { 'content-type': 'chemical/x-jcamp-dx; charset=us-ascii', 'content-disposition': `attachment; filename="bandcone-curve-${id}.jdx"` },
  });
});
