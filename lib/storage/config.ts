// Where raw files live: an S3-compatible bucket chosen by the environment alone, so the local
// fake (scripts/env.sh starts s3rver on loopback) and a managed service run the same code.
// Pure settings: no SDK here, so the page policy (proxy.ts) can read the bucket's origin cheaply.

export const LOCAL_S3_PORT = 4568;
/** s3rver's fixed credentials (its documentation); a real service gets its own through the environment. */
const LOCAL_KEY = 'S3RVER';

export type StorageConfig = {
  endpoint: string;
  bucket: string;
  region: string;
  accessKeyId: string;
  secretAccessKey: string;
  /** Bucket in the path (http://host/bucket/key), as fakes need; off for virtual-hosted buckets. */
  forcePathStyle: boolean;
};

export function storageConfig(env: Record<string, string | undefined> = process.env): StorageConfig {
  return {
    endpoint: (env.S3_ENDPOINT || `http://127.0.0.1:${env.BANDCONE_S3_PORT || LOCAL_S3_PORT}`).replace(/\/+$/, ''),
    bucket: env.S3_BUCKET || 'bandcone-raw',
    region: env.S3_REGION || 'us-east-1',
    accessKeyId: env.S3_ACCESS_KEY_ID || LOCAL_KEY,
    secretAccessKey: env.S3_SECRET_ACCESS_KEY || LOCAL_KEY,
    forcePathStyle: env.S3_FORCE_PATH_STYLE !== '0',
  };
}

/** The origin the browser sends its presigned PUT to: the page policy's connect-src must name it. */
export function bucketOrigin(config: StorageConfig = storageConfig()): string {
  const url = new URL(config.endpoint);
  if (!config.forcePathStyle) url.hostname = `${config.bucket}.${url.hostname}`;
  return url.origin;
}
