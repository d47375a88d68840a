import { z } from 'zod';
import { withErrors } from '@/lib/http/errors';
import { currentActor } from '@/lib/auth/actor';
import { parseCurveId } from '@/lib/catalogue/detail';
import { publicOrigin } from '@/lib/http/site';
import { loadCurveRecord } from '@/lib/catalogue/formats/load';
import { CITE_FORMATS, toBibtex, toCsl } from '@/lib/catalogue/formats/cite';

type Ctx = { params: Promise<{ id: string }> };

const query = z.object({ format: z.enum(CITE_FORMATS, { error: 'format must be bibtex or csl' }).default('bibtex') });

// "Cite this": the revision, its date, contributor, lab, licence and permanent address; readable curves only.
export const GET = withErrors(async (req: Request, ctx: Ctx) => {
  const id = parseCurveId((await ctx.params).id);
  const url = new URL(req.url);
  const { format } = query.parse({ format: url.searchParams.get('format') ?? undefined });
  const record = await loadCurveRecord(await currentActor(req), id, publicOrigin(url.origin));
  if (format === 'csl') {
    return new Response(JSON.stringify(toCsl(record), null, 1), {
      headers: { 'content-type': 'application/vnd.citationstyles.csl+json; charset=utf-8', 'content-disposition': `inline; filename="bandcone-curve-${id}.csl.json"` },
    });
  }
  return new Response(toBibtex(record), {
    headers: { 'content-type': 'application/x-bibtex; charset=utf-8', 'content-disposition': `inline; filename="bandcone-curve-${id}.bib"` },
  });
});
