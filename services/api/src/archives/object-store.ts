import type { Readable } from 'node:stream';
import {
  AbortMultipartUploadCommand,
  CompleteMultipartUploadCommand,
  CreateMultipartUploadCommand,
  GetObjectCommand,
  PutObjectCommand,
  HeadObjectCommand,
  ListPartsCommand,
  UploadPartCommand,
  type S3Client,
} from '@aws-sdk/client-s3';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import { errors } from '@localis/shared';
import { createS3Client, type StorageSettings } from '@localis/shared/node';

/** The store no longer knows the multipart upload (completed or abandoned). */
export const isNoSuchUpload = (e: unknown) => (e as { name?: string; Code?: string }).name === 'NoSuchUpload' || (e as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404;

/** Presigned part and download URLs live this long. */
export const PRESIGNED_SECONDS = 15 * 60;

export interface StoredPart {
  partNumber: number;
  sizeBytes: number;
  etag: string;
}

/**
 * The object store as Localis uses it: multipart uploads through presigned part URLs, parts
 * listed for resuming, downloads through short-lived URLs, and ranged reads for verification.
 * Keys come from ids only (see objectKeyOf), never from a person's file name.
 */
export function createObjectStore(settings: StorageSettings & { S3_BUCKET: string }, client: S3Client = createS3Client(settings)) {
  const Bucket = settings.S3_BUCKET;

  /** The store did not answer: a 503 the person can retry, not a 500. */
  async function call<T>(what: string, f: () => Promise<T>): Promise<T> {
    try {
      return await f();
    } catch (e) {
      const status = (e as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
      if (status === undefined || status >= 500) throw errors.unavailable(`The object store (${what})`);
      throw e;
    }
  }

  return {
    client,
    bucket: Bucket,

    async startUpload(key: string, contentType: string): Promise<string> {
      const out = await call('starting an upload', () => client.send(new CreateMultipartUploadCommand({ Bucket, Key: key, ContentType: contentType })));
      if (!out.UploadId) throw errors.unavailable('The object store (it gave no upload id)');
      return out.UploadId;
    },

    partUrl: (key: string, uploadId: string, partNumber: number) =>
      getSignedUrl(client, new UploadPartCommand({ Bucket, Key: key, UploadId: uploadId, PartNumber: partNumber }), { expiresIn: PRESIGNED_SECONDS }),

    /** Every part the store holds for an upload, in order (ListParts pages through 1000 at a time). */
    async listParts(key: string, uploadId: string): Promise<StoredPart[]> {
      const parts: StoredPart[] = [];
      let marker: string | undefined;
      for (;;) {
        const out = await call('listing stored parts', () => client.send(new ListPartsCommand({ Bucket, Key: key, UploadId: uploadId, PartNumberMarker: marker })));
        for (const p of out.Parts ?? []) parts.push({ partNumber: Number(p.PartNumber), sizeBytes: Number(p.Size), etag: String(p.ETag) });
        if (!out.IsTruncated) return parts;
        marker = String(out.NextPartNumberMarker);
      }
    },

    async completeUpload(key: string, uploadId: string, parts: StoredPart[]): Promise<void> {
      await call('completing an upload', () =>
        client.send(new CompleteMultipartUploadCommand({ Bucket, Key: key, UploadId: uploadId, MultipartUpload: { Parts: parts.map((p) => ({ PartNumber: p.partNumber, ETag: p.etag })) } })),
      );
    },

    async abortUpload(key: string, uploadId: string): Promise<void> {
      await call('abandoning an upload', () => client.send(new AbortMultipartUploadCommand({ Bucket, Key: key, UploadId: uploadId })));
    },

    async sizeOf(key: string): Promise<number | null> {
      try {
        const out = await client.send(new HeadObjectCommand({ Bucket, Key: key }));
        return Number(out.ContentLength);
      } catch (e) {
        if ((e as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404) return null;
        throw errors.unavailable('The object store (reading an object)');
      }
    },

    /**
     * A small object written whole (an invoice's PDF). Keys are written once: an existing object is
     * left as it is, so a retried write never replaces what was stored and sent.
     */
    async putOnce(key: string, bytes: Uint8Array, contentType: string): Promise<void> {
      if ((await this.sizeOf(key)) !== null) return;
      await call('storing an object', () => client.send(new PutObjectCommand({ Bucket, Key: key, Body: bytes, ContentType: contentType, ContentLength: bytes.byteLength })));
    },

    downloadUrl: (key: string, fileName: string) =>
      getSignedUrl(client, new GetObjectCommand({ Bucket, Key: key, ResponseContentDisposition: `attachment; filename="${fileName.replace(/["\\\r\n]/g, '_')}"` }), { expiresIn: PRESIGNED_SECONDS }),

    /** The object's bytes [start, end), or all of it. */
    async read(key: string, range?: { start: number; end: number }): Promise<Readable> {
      const out = await call('reading an object', () => client.send(new GetObjectCommand({ Bucket, Key: key, Range: range ? `bytes=${range.start}-${range.end - 1}` : undefined })));
      return out.Body as Readable;
    },
  };
}
export type ObjectStore = ReturnType<typeof createObjectStore>;

const EXTENSIONS: Record<string, string> = { 'tar.gz': 'tar.gz', tar: 'tar', zip: 'zip', pdf: 'pdf', csv: 'csv' };
const CONTENT_TYPES: Record<string, string> = { 'tar.gz': 'application/gzip', tar: 'application/x-tar', zip: 'application/zip', pdf: 'application/pdf', csv: 'text/csv' };

/** Keys are made of ids: a person's file name never reaches the store's namespace. */
export const objectKeyOf = (campaignId: string, archiveId: string, format: string) => `campaigns/${campaignId}/archives/${archiveId}.${EXTENSIONS[format]}`;
export const contentTypeOf = (format: string) => CONTENT_TYPES[format] ?? 'application/octet-stream';
