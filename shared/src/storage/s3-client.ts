import { S3Client } from '@aws-sdk/client-s3';

export interface StorageSettings {
  S3_ENDPOINT: string;
  S3_REGION: string;
  S3_ACCESS_KEY_ID: string;
  S3_SECRET_ACCESS_KEY: string;
}

/**
 * The one way Localis makes an S3 client (api, worker, CLI tests, seeds, benchmark). Path-style
 * addressing, and checksums only where S3 requires them: with the SDK's defaults a streamed upload
 * to an S3-compatible store can be stored with chunk framing in it, and presigned part URLs would
 * carry the checksum of an empty body. What is stored is verified by its SHA-256 instead.
 */
export function createS3Client(s: StorageSettings): S3Client {
  process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= 'true';
  return new S3Client({
    endpoint: s.S3_ENDPOINT,
    region: s.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: s.S3_ACCESS_KEY_ID, secretAccessKey: s.S3_SECRET_ACCESS_KEY },
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
}
