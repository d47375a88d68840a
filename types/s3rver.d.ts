// s3rver ships no types; the part scripts/s3-local.ts uses.
declare module 's3rver' {
  type Options = {
    address?: string;
    port?: number;
    directory: string;
    silent?: boolean;
    configureBuckets?: { name: string; configs: (string | Buffer)[] }[];
  };
  export default class S3rver {
    constructor(options: Options);
    run(): Promise<{ address: string; port: number }>;
    close(): Promise<void>;
  }
}
