import { withErrors } from '@/lib/http/errors';
import { currentActor } from '@/lib/auth/actor';
import { csvMetadata, getCurveFileWithPoints, parseCurveId } from '@/lib/catalogue/detail';
import { publicOrigin } from '@/lib/http/site';
import { writeCurveCsv } from '@/lib/engine/csv';

type Ctx = { params: Promise<{ id: string }> };

// Our own CSV: `#` metadata lines, then wavelength_nm,transmission; the upload reader reads it back unchanged.
export const GET = withErrors(async (req: Request, ctx: Ctx) => {
  const id = parseCurveId((await ctx.params).id);
  const actor = await currentActor(req);
  const { detail, points } = await getCurveFileWithPoints(actor, id, publicOrigin(new URL(req.url).origin));
  const csv = writeCurveCsv(csvMetadata(detail), points);
  return new Response(csv, {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="bandcone-curve-${id}.csv"`,
    },
  });
});
