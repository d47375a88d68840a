import { withErrors } from '@/lib/http/errors';
import { requireRole } from '@/lib/auth/actor';
import { getRawFile } from '@/moderation/views';
import { parseId } from '@/lib/http/ids';

// The file exactly as uploaded, for the moderator and the contributor.
export const GET = withErrors(async (req: Request, ctx: { params: Promise<{ id: string; fileId: string }> }) => {
  const actor = await requireRole('contributor', req);
  const { id, fileId } = await ctx.params;
  const file = await getRawFile(actor, parseId(id), parseId(fileId));
  return new Response(new Uint8Array(file.content), {
    headers: {
      'content-type': 'text/plain; charset=utf-8',
      'content-disposition': `attachment; filename="${file.originalName.replace(/[^\w.\- ]/g, '_')}"`,
      'x-content-sha256': file.sha256,
    },
  });
});
