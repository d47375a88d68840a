// The local stand-in for an S3 bucket: s3rver on loopback, its objects under .data/, the bucket
// made on first start with a CORS rule that lets the app's pages PUT to presigned URLs.
//   npx tsx scripts/s3-local.ts [--port 4568] [--dir .data/s3]
// Bucket name and credentials come from the same S3_* variables the app reads (lib/storage/config.ts).
import path from 'node:path';
import { mkdirSync } from 'node:fs';
import S3rver from 's3rver';
import { storageConfig, LOCAL_S3_PORT } from '@/lib/storage/config';

function arg(name: string): string | undefined {
  const i = process.argv.indexOf(name);
  return i > 0 ? process.argv[i + 1] : undefined;
}

const port = Number(arg('--port') ?? process.env.BANDCONE_S3_PORT ?? LOCAL_S3_PORT);
const directory = path.resolve(arg('--dir') ?? '.data/s3');
mkdirSync(directory, { recursive: true });

// Loopback only, so any origin may PUT: the page policy (connect-src) and the signature are the guards.
const cors = `<CORSConfiguration>
  <CORSRule>
    <AllowedOrigin>*</AllowedOrigin>
    <AllowedMethod>PUT</AllowedMethod>
    <AllowedMethod>GET</AllowedMethod>
    <AllowedMethod>HEAD</AllowedMethod>
    <AllowedHeader>*</AllowedHeader>
    <ExposeHeader>ETag</ExposeHeader>
    <MaxAgeSeconds>600</MaxAgeSeconds>
  </CORSRule>
</CORSConfiguration>`;

const server = new S3rver({
  address: '127.0.0.1',
  port,
  directory,
  silent: true,
  configureBuckets: [{ name: storageConfig().bucket, configs: [cors] }],
});
const { address, port: bound } = await server.run();
console.log(`fake S3 (s3rver) on http://${address}:${bound}, bucket ${storageConfig().bucket}, data in ${directory}`);
const stop = () => void server.close().finally(() => process.exit(0));
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
