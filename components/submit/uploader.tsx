'use client';

import { useEffect, useState } from 'react';
import Uppy, { type Meta } from '@uppy/core';
import AwsS3 from '@uppy/aws-s3';
import { UppyContextProvider, useDropzone } from '@uppy/react';
import { MAX_FILE_BYTES } from '@/lib/engine/reader/limits';
import type { Json } from '@/lib/api-client';
import type { SubmissionAnswer } from '@/moderation/submissions';

/** What the submission routes answer (the server's own type, through lib/api-client.ts). */
export type UploadBody = Json<SubmissionAnswer>;
/** Each file's meta carries the uploadId the server named its staging copy with. */
export type UploadMeta = Meta & { uploadId?: string };
export type SubmissionUppy = Uppy<UploadMeta, Record<string, never>>;

export const ALLOWED_TYPES = ['.csv', '.tsv', '.txt', '.dat', '.asc', '.jdx', '.dx', '.jcamp', 'text/*'];
export { MAX_FILE_BYTES } from '@/lib/engine/reader/limits';
export const MAX_FILES = 20;

/** A thrown error carrying the error body of docs/api.md §Errors, so the page can map it back onto fields and files. */
export class UploadRefused extends Error {
  constructor(
    public status: number,
    public body: { error: string; details?: { field?: string; line?: number; message: string }[] },
  ) {
    super(body.error);
  }
}

async function sha256Hex(data: Blob): Promise<string> {
  const digest = await crypto.subtle.digest('SHA-256', await data.arrayBuffer());
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}

/**
 * One Uppy per page. Each file goes straight to the file store with a presigned PUT: the
 * server is told its name, size and SHA-256 first (POST /api/uploads/presign) and answers with
 * a signed address of a staging key it names. The submission (submitStaged) then names the
 * uploadIds; the server checks each staged file against what was announced. A refusal (4xx) is
 * final; the file store being away (503) is said in the server's words.
 */
export function useSubmissionUppy(presignEndpoint = '/api/uploads/presign'): SubmissionUppy {
  const [uppy] = useState(() => {
    const u: SubmissionUppy = new Uppy<UploadMeta, Record<string, never>>({
      id: 'submission',
      autoProceed: false,
      restrictions: { allowedFileTypes: ALLOWED_TYPES, maxFileSize: MAX_FILE_BYTES, maxNumberOfFiles: MAX_FILES },
    });
    return u.use(AwsS3, {
      shouldUseMultipart: false,
      limit: 4,
      allowedMetaFields: false,
      // The key Uppy asks to sign is the file's id; the server's answer replaces it with the staging key.
      generateObjectKey: (file) => file.id,
      signRequest: async (request) => {
        const file = u.getFile(request.key);
        if (request.method !== 'PUT' || !file) throw new Error('Only whole files are sent to the file store.');
        const data = file.data as Blob;
        const res = await fetch(presignEndpoint, {
          method: 'POST',
          headers: { 'content-type': 'application/json' },
          body: JSON.stringify({ name: file.name, size: data.size, sha256: await sha256Hex(data), type: data.type || undefined }),
        });
        const body = await res.json().catch(() => ({ error: `The server answered ${res.status}.` }));
        if (!res.ok) throw new UploadRefused(res.status, body);
        u.setFileMeta(file.id, { uploadId: body.uploadId });
        return { url: body.url, key: `staging/${body.uploadId}`, headers: body.headers };
      },
    });
  });
  return uppy;
}

/**
 * Sends the submission once every file is in the file store: metadata and the staged uploadIds,
 * as JSON. A lost connection or a gateway hiccup is tried again (three tries, 1 s then 2 s apart);
 * sending it twice cannot make two submissions, since the server takes each staged file once.
 */
export async function submitStaged(endpoint: string, uppy: SubmissionUppy, metadata: unknown): Promise<UploadBody> {
  const uploads = uppy.getFiles().map((f) => f.meta.uploadId).filter((id): id is string => !!id);
  for (let attempt = 1; ; attempt++) {
    let res: Response | null = null;
    try {
      res = await fetch(endpoint, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ metadata, uploads }) });
    } catch {
      res = null;
    }
    const transient = res === null || res.status === 502 || res.status === 503 || res.status === 504;
    if (transient && attempt < 3) {
      await new Promise((r) => setTimeout(r, 1000 * attempt));
      continue;
    }
    if (res === null) throw new UploadRefused(0, { error: 'network' });
    const answer = res;
    const body = await answer.json().catch(() => ({ error: `The server answered ${answer.status}.` }));
    if (!answer.ok) throw new UploadRefused(answer.status, body);
    return body as UploadBody;
  }
}

/**
 * The drop zone: a drop target and a "choose files" button, nothing more. The file cards
 * below it are the one list of files (Uppy's own dashboard listed each file a second time
 * and kept 300 px of blank panel on a phone). A file Uppy refuses (type, size, count) is
 * said here in a sentence.
 */
export function UploadDropzone({ uppy, note, hasFiles }: { uppy: SubmissionUppy; note: string; hasFiles: boolean }) {
  return (
    <UppyContextProvider uppy={uppy as unknown as Uppy}>
      <Zone uppy={uppy} note={note} hasFiles={hasFiles} />
    </UppyContextProvider>
  );
}

function Zone({ uppy, note, hasFiles }: { uppy: SubmissionUppy; note: string; hasFiles: boolean }) {
  const [over, setOver] = useState(false);
  const [refused, setRefused] = useState<string[]>([]);
  useEffect(() => {
    const failed = (file: { name?: string } | undefined, error: Error) => setRefused((r) => [...r.slice(-3), `${file?.name ? `${file.name}: ` : ''}${error.message}`]);
    uppy.on('restriction-failed', failed);
    return () => void uppy.off('restriction-failed', failed);
  }, [uppy]);
  const { getRootProps, getInputProps } = useDropzone({
    onDragEnter: () => setOver(true),
    onDragLeave: () => setOver(false),
    onDrop: () => {
      setOver(false);
      setRefused([]);
    },
    onFileInputChange: () => setRefused([]),
  });
  // Enter or space on the button already clicks it; the zone's own key handler would open the dialog twice.
  const { onKeyPress: _keys, ...root } = getRootProps() as ReturnType<typeof getRootProps> & { onKeyPress?: unknown };
  return (
    <div className="space-y-1">
      <div
        {...root}
        data-testid="drop-zone"
        className={`flex cursor-pointer flex-wrap items-center gap-x-3 gap-y-1 rounded-card border border-dashed px-4 text-sm ${hasFiles ? 'py-2' : 'py-6'} ${over ? 'border-accent bg-accent/5' : 'border-rule bg-paper'}`}
      >
        {/* .uppy-Dashboard-input: the name the browser tests have always used to add files */}
        <input {...getInputProps()} className="uppy-Dashboard-input sr-only" tabIndex={-1} aria-hidden="true" data-testid="file-input" />
        <span>{hasFiles ? 'Drop more files here or' : 'Drop curve files here or'}</span>
        <button type="button" className="rounded-card border border-accent px-2 py-1 text-accent hover:bg-accent/10">
          {hasFiles ? 'add files' : 'choose files'}
        </button>
      </div>
      <p className="text-xs text-muted">{note}</p>
      {refused.map((r) => (
        <p key={r} role="alert" className="text-sm text-bad">{r}</p>
      ))}
    </div>
  );
}
