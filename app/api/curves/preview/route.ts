import { NextResponse } from 'next/server';
import { withErrors, readJson, HttpError, badRequest } from '@/lib/http/errors';
import { POINTS_BODY_MAX, parseJsonText, readFormCapped } from '@/lib/http/body';
import { readCurveText, MAX_FILE_BYTES } from '@/lib/engine/reader';
import { cleanPoints } from '@/lib/engine/curve';
import { previewOf } from '@/lib/engine/preview';
import type { ReadAssumptions } from '@/lib/engine/reader/types';
import { pointsSchema, readerOptionsSchema } from '@/lib/schemas/model';
import { previewMetadataSchema } from '@/lib/schemas/submission';
import { clientAddress, overLimit } from '@/lib/rate-limit';

const PER_MINUTE = Number(process.env.PREVIEW_RATE_PER_MINUTE ?? 120);

function parseJsonField(raw: FormDataEntryValue | null, what: string): unknown {
  if (raw === null || raw === '') return undefined;
  if (typeof raw !== 'string') throw badRequest(`The "${what}" field must be JSON text.`);
  return parseJsonText(raw, `The "${what}" field`);
}

// Stores nothing: reads a file (or points), derives the numbers and runs the checks.
export const POST = withErrors(async (req: Request) => {
  if (await overLimit(`preview:${clientAddress(req.headers)}`, PER_MINUTE, 60)) {
    throw new HttpError(429, 'Too many previews from this address; wait a minute.');
  }
  const type = req.headers.get('content-type') ?? '';
  let read: { points: { wavelengthNm: number[]; transmission: number[] }; assumed?: ReadAssumptions; warnings: string[] };
  let metadata: unknown;
  if (type.startsWith('multipart/form-data')) {
    const form = await readFormCapped(req, MAX_FILE_BYTES + 256 * 1024, 'The file');
    const file = form.get('file');
    if (!file || typeof file === 'string') throw badRequest('Attach the data file in the "file" field.');
    if (file.size > MAX_FILE_BYTES) throw new HttpError(413, `${file.name} is ${(file.size / 1048576).toFixed(1)} MB; the limit is 5 MB.`);
    const options = readerOptionsSchema.parse(parseJsonField(form.get('options'), 'options') ?? {});
    metadata = parseJsonField(form.get('metadata'), 'metadata');
    const r = readCurveText(new Uint8Array(await file.arrayBuffer()), options);
    read = { points: r.points, assumed: r.assumed, warnings: r.warnings };
  } else {
    const body = (await readJson(req, POINTS_BODY_MAX)) as { points?: unknown; metadata?: unknown };
    const points = pointsSchema.parse(body?.points);
    metadata = body?.metadata;
    const cleaned = cleanPoints(points);
    read = { points: cleaned.points, warnings: cleaned.warnings };
  }
  // Lenient: a half-filled form still gets the checks its filled fields allow.
  const meta = metadata === undefined ? undefined : previewMetadataSchema.safeParse(metadata);
  return NextResponse.json(previewOf(read, meta?.success ? meta.data : undefined));
});
