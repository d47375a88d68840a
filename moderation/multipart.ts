import { HttpError } from '@/lib/http/errors';
import type { IncomingFile } from './intake';
import { MAX_FILES, MAX_FILE_BYTES } from './intake';

const MAX_BODY = MAX_FILES * MAX_FILE_BYTES + 1024 * 1024;

/** Reads `file` (one or more) and `metadata` from a multipart body, refusing oversize bodies before buffering them. */
export async function readSubmissionForm(req: Request): Promise<{ metadata: unknown; files: IncomingFile[] }> {
  const length = Number(req.headers.get('content-length') ?? 0);
  if (length > MAX_BODY) throw new HttpError(413, `The upload is ${(length / 1048576).toFixed(0)} MB; send at most ${MAX_FILES} files of 5 MB each.`);
  const type = req.headers.get('content-type') ?? '';
  if (!type.startsWith('multipart/form-data')) throw new HttpError(400, 'Send multipart/form-data with "file" and "metadata" fields.');
  let form: FormData;
  try {
    form = await req.formData();
  } catch {
    throw new HttpError(400, 'The multipart body could not be read.');
  }
  const files: IncomingFile[] = [];
  for (const entry of form.getAll('file')) {
    if (typeof entry === 'string') throw new HttpError(400, 'The "file" field must hold files, not text.');
    if (entry.size > MAX_FILE_BYTES) throw new HttpError(413, `${entry.name} is ${(entry.size / 1048576).toFixed(1)} MB; the limit is 5 MB a file.`);
    files.push({ name: entry.name || `file-${files.length + 1}.csv`, bytes: Buffer.from(await entry.arrayBuffer()) });
  }
  const metadata = form.get('metadata');
  return { metadata: typeof metadata === 'string' ? metadata : undefined, files };
}
