// s3rver ships no types; this covers the part the local fakes and tests use.
declare module "s3rver" {
  type S3rverOptions = {
    address?: string;
    port?: number;
    silent?: boolean;
    directory?: string;
    resetOnClose?: boolean;
    configureBuckets?: Array<{ name: string; configs: Array<string | Buffer> }>;
  };
  export default class S3rver {
    constructor(options?: S3rverOptions);
    run(): Promise<{ address: string; port: number }>;
    close(): Promise<void>;
  }
}
