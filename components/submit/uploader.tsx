'use client';

import { useEffect, useState } from 'react';
import Uppy, { type Meta } from '@uppy/core';
import XHRUpload from '@uppy/xhr-upload';
import { UppyContextProvider, useDropzone } from '@uppy/react';
import { MAX_FILE_BYTES } from '@/lib/engine/reader/limits';

export type UploadBody = { id: number; status: string; error?: string };
export type SubmissionUppy = Uppy<Meta, UploadBody>;

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

/**
 * One Uppy per page. Every file goes in ONE multipart request (a set is one submission),
 * with the metadata JSON as a form field. Broken connections and gateway hiccups are
 * retried with back-off; a refusal (4xx) is final, since sending it again cannot help.
 */
export function useSubmissionUppy(endpoint: string): SubmissionUppy {
  const [uppy] = useState(() =>
    new Uppy<Meta, UploadBody>({
      id: 'submission',
      autoProceed: false,
      restrictions: { allowedFileTypes: ALLOWED_TYPES, maxFileSize: MAX_FILE_BYTES, maxNumberOfFiles: MAX_FILES },
    }).use(XHRUpload, {
      endpoint,
      bundle: true,
      formData: true,
      fieldName: 'file',
      allowedMetaFields: ['metadata'],
      limit: 1,
      timeout: 120_000,
      shouldRetry: (xhr) => xhr.status === 0 || xhr.status === 502 || xhr.status === 503 || xhr.status === 504,
      onAfterResponse: (xhr) => {
        if (xhr.status < 400 || xhr.status >= 500) return;
        let body: UploadRefused['body'];
        try {
          body = JSON.parse(xhr.responseText);
        } catch {
          body = { error: `The server answered ${xhr.status}.` };
        }
        throw new UploadRefused(xhr.status, body);
      },
    }),
  );
  return uppy;
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
