import { NextResponse } from 'next/server';
import { withErrors, readJson } from '@/lib/http/errors';
import { fieldMapRequestSchema } from '@/lib/schemas/field-map';
import { currentActor } from '@/lib/auth/actor';
import { runFieldMap } from '@/lib/model/field-map';

// Public like the cone study: anyone may map a verified curve or their own points.
export const POST = withErrors(async (req: Request) => {
  const body = fieldMapRequestSchema.parse(await readJson(req));
  return NextResponse.json(await runFieldMap(await currentActor(req), body));
});
