import { NextResponse } from 'next/server';
import { withErrors } from '@/lib/http/errors';
import { requireRole } from '@/lib/auth/actor';
import { readSubmission } from '@/moderation/multipart';
import { createSubmission, parseMetadata } from '@/moderation/submissions';
import { listSubmissions } from '@/moderation/views';

export const POST = withErrors(async (req: Request) => {
  const actor = await requireRole('contributor', req);
  const { metadata, files } = await readSubmission(req, actor.id);
  const result = await createSubmission(actor, parseMetadata(metadata), files);
  return NextResponse.json(result, { status: 201 });
});

export const GET = withErrors(async (req: Request) => {
  const actor = await requireRole('contributor', req);
  const status = new URL(req.url).searchParams.get('status') ?? undefined;
  return NextResponse.json(await listSubmissions(actor, status));
});
