// Local type declaration for the parts of s3rver the cluster and the tests use (the package ships no types).
declare module 's3rver' {
  interface S3rverOptions {
    address?: string;
    port?: number;
    silent?: boolean;
    directory: string;
    resetOnClose?: boolean;
    configureBuckets?: { name: string; configs?: unknown[] }[];
  }
  export default class S3rver {
    constructor(options: S3rverOptions);
    run(): Promise<{ address: string; port: number }>;
    close(): Promise<void>;
  }
}
