import { z } from './zod';
import { MAX_FILE_BYTES } from '@/lib/engine/reader/limits';

export const MAX_FILES_PER_SUBMISSION = 20;

// POST /api/uploads/presign: what the browser says about a file before it sends it to the file store.
export const presignSchema = z.object({
  name: z.string().trim().min(1, 'Give the file name').max(255, 'A file name has at most 255 characters'),
  size: z.number().int().min(1, 'The file is empty').max(MAX_FILE_BYTES, 'The limit is 5 MB a file'),
  // A fixed-length run of one class: checked in linear time whatever was sent.
  sha256: z.string().length(64, 'sha256 is 64 hexadecimal digits').regex(/^[0-9a-f]{64}$/, 'sha256 is 64 lowercase hexadecimal digits'),
  type: z.string().max(200).optional(),
});
export type PresignInput = z.infer<typeof presignSchema>;

// POST /api/submissions (and …/revise) as JSON: the metadata, and the files already in the file store.
export const stagedSubmissionSchema = z.object({
  metadata: z.unknown(),
  uploads: z.array(z.uuid('Each upload is the uploadId that /api/uploads/presign gave')).max(MAX_FILES_PER_SUBMISSION, `At most ${MAX_FILES_PER_SUBMISSION} files per submission`).default([]),
});
