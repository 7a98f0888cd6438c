// s3rver ships no types; this is the part scripts/fakes.ts uses.
declare module "s3rver" {
  type Options = {
    port?: number;
    address?: string;
    silent?: boolean;
    directory: string;
    configureBuckets?: { name: string; configs: unknown[] }[];
  };
  export default class S3rver {
    constructor(options: Options);
    run(): Promise<{ address: string; port: number }>;
    close(): Promise<void>;
  }
}
