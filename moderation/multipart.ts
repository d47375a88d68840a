import { HttpError, readJson } from '@/lib/http/errors';
import { stagedSubmissionSchema } from '@/lib/schemas/upload';
import { takeStagedFiles } from '@/lib/storage/uploads';
import { readFormCapped } from '@/lib/http/body';
import type { IncomingFile } from './intake';
import { MAX_FILES, MAX_FILE_BYTES } from './intake';

const MAX_BODY = MAX_FILES * MAX_FILE_BYTES + 1024 * 1024;

/** Reads `file` (one or more) and `metadata` from a multipart body, counting bytes as they stream and refusing at the cap. */
export async function readSubmissionForm(req: Request): Promise<{ metadata: unknown; files: IncomingFile[] }> {
  const type = req.headers.get('content-type') ?? '';
  if (!type.startsWith('multipart/form-data')) throw new HttpError(400, 'Send multipart/form-data with "file" and "metadata" fields.');
  // Counted while it streams: refused at the cap whatever Content-Length said, or without one.
  const form = await readFormCapped(req, MAX_BODY, `The upload (at most ${MAX_FILES} files of 5 MB each)`);
  const files: IncomingFile[] = [];
  for (const entry of form.getAll('file')) {
    if (typeof entry === 'string') throw new HttpError(400, 'The "file" field must hold files, not text.');
    if (entry.size > MAX_FILE_BYTES) throw new HttpError(413, `${entry.name} is ${(entry.size / 1048576).toFixed(1)} MB; the limit is 5 MB a file.`);
    files.push({ name: entry.name || `file-${files.length + 1}.csv`, bytes: Buffer.from(await entry.arrayBuffer()), mediaType: entry.type || undefined });
  }
  const metadata = form.get('metadata');
  return { metadata: typeof metadata === 'string' ? metadata : undefined, files };
}

/**
 * A submission's body either way: multipart with the files themselves (API clients), or JSON
 * naming files already sent to the file store (`uploads`, from POST /api/uploads/presign),
 * which are read back and checked against what was announced before anything is written.
 */
export async function readSubmission(req: Request, userId: string): Promise<{ metadata: unknown; files: IncomingFile[] }> {
  if (!(req.headers.get('content-type') ?? '').startsWith('application/json')) return readSubmissionForm(req);
  const raw = await readJson(req);
  if (!Array.isArray((raw as { uploads?: unknown } | null)?.uploads) || ((raw as { uploads: unknown[] }).uploads.length === 0)) {
    throw new HttpError(400, 'Send multipart/form-data with "file" and "metadata" fields, or JSON {"metadata", "uploads"} naming at least one file sent through /api/uploads/presign.');
  }
  const body = stagedSubmissionSchema.parse(raw);
  return { metadata: body.metadata, files: await takeStagedFiles(userId, body.uploads) };
}
