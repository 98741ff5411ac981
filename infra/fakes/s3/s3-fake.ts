import { mkdirSync } from 'node:fs';
import S3rver from 's3rver';

export interface S3FakeOptions {
  host: string;
  port: number;
  directory: string;
  buckets: string[];
}

/** s3rver: a local S3-compatible object store with its data on disk, buckets made at start. */
export async function startS3Fake(opts: S3FakeOptions): Promise<{ close: () => Promise<void> }> {
  mkdirSync(opts.directory, { recursive: true });
  const server = new S3rver({
    address: opts.host,
    port: opts.port,
    directory: opts.directory,
    silent: true,
    configureBuckets: opts.buckets.map((name) => ({ name, configs: [] })),
  });
  await server.run();
  return { close: () => server.close() };
}
