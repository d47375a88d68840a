import { NextResponse } from 'next/server';
import { readJson, withErrors } from '@/lib/http/errors';
import { requireRole } from '@/lib/auth/actor';
import { presignSchema } from '@/lib/schemas/upload';
import { presignUpload } from '@/lib/storage/uploads';

// A signed address to PUT one file to the file store's staging area; the submission then names its uploadId.
export const POST = withErrors(async (req: Request) => {
  const actor = await requireRole('contributor', req);
  const input = presignSchema.parse(await readJson(req));
  return NextResponse.json(await presignUpload(actor.id, input), { status: 201 });
});
