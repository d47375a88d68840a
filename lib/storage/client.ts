import { S3Client } from '@aws-sdk/client-s3';
import { storageConfig } from './config';

let client: S3Client | undefined;

/**
 * One S3 client per process. Checksums only where the API requires them: recent SDKs add
 * CRC32 checksums to every upload and check them on every download, which fakes refuse or
 * lack. Short timeouts and two attempts, so a bucket that is away turns into a 503 within a
 * few seconds instead of a hanging request.
 */
export function s3(): S3Client {
  if (!client) {
    const c = storageConfig();
    client = new S3Client({
      endpoint: c.endpoint,
      region: c.region,
      forcePathStyle: c.forcePathStyle,
      credentials: { accessKeyId: c.accessKeyId, secretAccessKey: c.secretAccessKey },
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
      maxAttempts: 2,
      requestHandler: { connectionTimeout: 2000, requestTimeout: 15_000 },
    });
  }
  return client;
}

export function bucket(): string {
  return storageConfig().bucket;
}
