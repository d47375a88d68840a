import { describe, expect, it } from 'vitest';
import { bucketOrigin, storageConfig } from '@/lib/storage/config';
import { pageCsp } from '@/lib/http/security-headers';

// Where the browser sends its presigned PUT, and that the page policy lets it. Path-style and
// virtual-hosted addresses as the S3 user guide describes them (from memory: "Virtual hosting of
// buckets" — bucket in the path, or as the first label of the host).
describe('the file store settings', () => {
  it('default to the local fake on loopback with its fixed credentials', () => {
    const c = storageConfig({});
    expect(c).toMatchObject({ endpoint: 'http://127.0.0.1:4568', bucket: 'bandcone-raw', region: 'us-east-1', accessKeyId: 'S3RVER', forcePathStyle: true });
    expect(storageConfig({ BANDCONE_S3_PORT: '4617' }).endpoint).toBe('http://127.0.0.1:4617');
  });

  it('select a real service by the environment alone', () => {
    const c = storageConfig({ S3_ENDPOINT: 'https://objects.example.net/', S3_BUCKET: 'curves', S3_REGION: 'eu-west-3', S3_ACCESS_KEY_ID: 'k', S3_SECRET_ACCESS_KEY: 's', S3_FORCE_PATH_STYLE: '0' });
    expect(c).toEqual({ endpoint: 'https://objects.example.net', bucket: 'curves', region: 'eu-west-3', accessKeyId: 'k', secretAccessKey: 's', forcePathStyle: false });
    expect(bucketOrigin(c)).toBe('https://curves.objects.example.net');
    expect(bucketOrigin({ ...c, forcePathStyle: true })).toBe('https://objects.example.net');
  });

  it('the page policy allows connections to the store and nowhere else new', () => {
    const csp = pageCsp('n0nce', false, 'http://127.0.0.1:4568');
    const connect = csp.split('; ').find((d) => d.startsWith('connect-src'));
    expect(connect).toBe("connect-src 'self' http://127.0.0.1:4568");
  });
});
