import { createHash, randomBytes } from 'node:crypto';

// Secrets handed to people are random; only their SHA-256 is stored.
export function newSecret(prefix: string): string {
  return `${prefix}_${randomBytes(24).toString('base64url')}`;
}

export function sha256Hex(value: string | Buffer | Uint8Array): string {
  return createHash('sha256').update(value).digest('hex');
}
