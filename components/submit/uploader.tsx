'use client';

import { useState } from 'react';
import Uppy, { type Meta } from '@uppy/core';
import XHRUpload from '@uppy/xhr-upload';
import Dashboard from '@uppy/react/dashboard';
import '@uppy/core/css/style.min.css';
import '@uppy/dashboard/css/style.min.css';
import './uploader.css';
import { MAX_FILE_BYTES } from '@/lib/engine/reader/limits';
import type { Json } from '@/lib/api-client';
import type { SubmissionAnswer } from '@/moderation/submissions';

/** What the submission routes answer (the server's own type, through lib/api-client.ts). */
export type UploadBody = Json<SubmissionAnswer>;
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

export function UploadDashboard({ uppy, note }: { uppy: SubmissionUppy; note: string }) {
  return (
    <Dashboard
      uppy={uppy}
      height={300}
      width="100%"
      note={note}
      hideUploadButton
      proudlyDisplayPoweredByUppy={false}
      disableThumbnailGenerator
      showRemoveButtonAfterComplete={false}
      hidePauseResumeButton
      fileManagerSelectionType="files"
      locale={{ strings: { dropPasteFiles: 'Drop curve files here or %{browseFiles}', browseFiles: 'choose files' } }}
    />
  );
}
