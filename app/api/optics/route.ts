import { NextResponse } from 'next/server';
import { withErrors, readJson } from '@/lib/http/errors';
import { currentActor, requireRole } from '@/lib/auth/actor';
import { opticInputSchema } from '@/lib/schemas/optics';
import { createOptic, listOptics } from '@/lib/optics/store';

// Deliberately public: visitors get the example optics so the cone study works signed out.
export const GET = withErrors(async (req: Request) => {
  const actor = await currentActor(req);
  const items = await listOptics(actor);
  return NextResponse.json({ items, total: items.length });
});

export const POST = withErrors(async (req: Request) => {
  const actor = await requireRole('contributor', req);
  const input = opticInputSchema.parse(await readJson(req));
  return NextResponse.json(await createOptic(actor, input), { status: 201 });
});
