// The parts of s3rver 3.7 (MIT) the tests use; the package ships no types.
declare module 's3rver' {
  export default class S3rver {
    constructor(options: { port?: number; address?: string; silent?: boolean; directory: string });
    run(): Promise<{ address: string; port: number }>;
    close(): Promise<void>;
  }
}
