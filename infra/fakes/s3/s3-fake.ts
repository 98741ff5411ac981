import { mkdirSync } from 'node:fs';
import { readdir, readFile, rm, stat } from 'node:fs/promises';
import { join } from 'node:path';
import S3rver from 's3rver';

export interface S3FakeOptions {
  host: string;
  port: number;
  directory: string;
  buckets: string[];
  /** Origins allowed to PUT parts and GET objects from a browser (the portal's). */
  corsOrigins?: string[];
}

/** The bucket's CORS rule: the portal uploads parts straight to the store through presigned URLs. */
function corsXml(origins: string[]): string {
  return `<CORSConfiguration>
  <CORSRule>
    ${origins.map((o) => `<AllowedOrigin>${o}</AllowedOrigin>`).join('\n    ')}
    <AllowedMethod>PUT</AllowedMethod>
    <AllowedMethod>GET</AllowedMethod>
    <AllowedMethod>HEAD</AllowedMethod>
    <AllowedHeader>*</AllowedHeader>
    <ExposeHeader>ETag</ExposeHeader>
    <MaxAgeSeconds>3000</MaxAgeSeconds>
  </CORSRule>
</CORSConfiguration>`;
}

interface KoaContext {
  method: string;
  path: string;
  query: Record<string, string | undefined>;
  status: number;
  body: unknown;
}

/**
 * s3rver answers neither ListParts nor AbortMultipartUpload, which S3 has and which a resumable
 * upload needs (the api asks the store which parts it holds). This middleware adds both, reading
 * s3rver's own upload folder: a part counts once its checksum file is written, i.e. once its PUT
 * was answered.
 */
function multipartExtras(directory: string) {
  const uploadsDir = (bucket: string) => join(directory, bucket, '._S3rver_uploads');
  return async (ctx: KoaContext, next: () => Promise<unknown>) => {
    const match = /^\/([^/]+)\/(.+)$/.exec(ctx.path);
    const uploadId = ctx.query.uploadId;
    const listing = ctx.method === 'GET' && uploadId && !ctx.query.partNumber;
    const aborting = ctx.method === 'DELETE' && uploadId;
    if (!match || !(listing || aborting) || !/^[0-9a-f]+$/.test(uploadId!)) return next();
    const [, bucket, key] = match;
    const dir = join(uploadsDir(bucket), uploadId!);
    const storedKey = await readFile(join(dir, 'key'), 'utf8').catch(() => null);
    if (storedKey === null || storedKey !== decodeURIComponent(key)) {
      ctx.status = 404;
      ctx.body = { Error: { Code: 'NoSuchUpload', Message: 'The specified multipart upload does not exist.', UploadId: uploadId } };
      return;
    }
    if (aborting) {
      await rm(dir, { recursive: true, force: true });
      ctx.status = 204;
      ctx.body = '';
      return;
    }
    const marker = Number(ctx.query['part-number-marker'] ?? 0);
    const maxParts = Math.min(1000, Number(ctx.query['max-parts'] ?? 1000));
    const names = await readdir(dir);
    const numbers = names
      .filter((n) => n.endsWith('.md5'))
      .map((n) => Number(n.slice(0, -4)))
      .filter((n) => Number.isInteger(n) && n > marker)
      .sort((a, b) => a - b);
    const page = numbers.slice(0, maxParts);
    const parts = await Promise.all(
      page.map(async (n) => {
        const [info, md5] = await Promise.all([stat(join(dir, String(n))), readFile(join(dir, `${n}.md5`), 'utf8')]);
        return { PartNumber: n, LastModified: info.mtime.toISOString(), ETag: `"${md5.trim()}"`, Size: info.size };
      }),
    );
    const truncated = numbers.length > page.length;
    ctx.status = 200;
    ctx.body = {
      ListPartsResult: {
        Bucket: bucket,
        Key: decodeURIComponent(key),
        UploadId: uploadId,
        PartNumberMarker: marker,
        NextPartNumberMarker: page.length ? page[page.length - 1] : marker,
        MaxParts: maxParts,
        IsTruncated: truncated,
        ...(parts.length ? { Part: parts } : {}),
      },
    };
  };
}

/** s3rver: a local S3-compatible object store with its data on disk, buckets made at start. */
export async function startS3Fake(opts: S3FakeOptions): Promise<{ close: () => Promise<void> }> {
  mkdirSync(opts.directory, { recursive: true });
  const configs = opts.corsOrigins?.length ? [corsXml(opts.corsOrigins)] : [];
  const server = new S3rver({
    address: opts.host,
    port: opts.port,
    directory: opts.directory,
    silent: true,
    configureBuckets: opts.buckets.map((name) => ({ name, configs })),
  });
  // Just before s3rver's router, after its XML encoder (so our plain-object bodies become XML).
  const stack = (server as unknown as { middleware: unknown[] }).middleware;
  stack.splice(stack.length - 1, 0, multipartExtras(opts.directory));
  await server.run();
  return { close: () => server.close() };
}
