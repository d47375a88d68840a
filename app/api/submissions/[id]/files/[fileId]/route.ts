import { withErrors } from '@/lib/http/errors';
import { requireRole } from '@/lib/auth/actor';
import { getRawFile } from '@/moderation/views';
import { parseId } from '@/lib/http/ids';
import { rawFileBytes } from '@/lib/storage/uploads';
import { STORE_DOWN_DOWNLOAD } from '@/lib/storage/errors';

// The file exactly as uploaded, for the moderator and the contributor.
export const GET = withErrors(async (req: Request, ctx: { params: Promise<{ id: string; fileId: string }> }) => {
  const actor = await requireRole('contributor', req);
  const { id, fileId } = await ctx.params;
  const file = await getRawFile(actor, parseId(id), parseId(fileId));
  // From the file store (raw/<sha256>); while it is away, a 503 with Retry-After.
  const bytes = await rawFileBytes(file, STORE_DOWN_DOWNLOAD);
  return new Response(new Uint8Array(bytes), {
    headers: {
      'content-type': 'text/plain; charset=utf-8',
      'content-disposition': `attachment; filename="${file.originalName.replace(/[^\w.\- ]/g, '_')}"`,
      'x-content-sha256': file.sha256,
    },
  });
});
