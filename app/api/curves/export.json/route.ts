import { withErrors } from '@/lib/http/errors';
import { parseSearchParams } from '@/lib/catalogue/search-params';
import { exportJson } from '@/lib/catalogue/export';
import { publicOrigin } from '@/lib/http/site';

// Public: verified curves only, whoever asks; streamed a batch of curves at a time.
export const GET = withErrors(async (req: Request) => {
  const url = new URL(req.url);
  const params = parseSearchParams(url.searchParams);
  const { stream, count } = await exportJson(params, url.searchParams.toString(), publicOrigin(url.origin));
  return new Response(stream, {
    headers: {
      'content-type': 'application/json; charset=utf-8',
      'content-disposition': 'attachment; filename="bandcone-export.json"',
      'x-curve-count': String(count),
    },
  });
});
