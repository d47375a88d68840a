import { HttpError } from '@/lib/http/errors';
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
    files.push({ name: entry.name || `file-${files.length + 1}.csv`, bytes: Buffer.from(await entry.arrayBuffer()) });
  }
  const metadata = form.get('metadata');
  return { metadata: typeof metadata === 'string' ? metadata : undefined, files };
}
