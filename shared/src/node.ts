/**
 * Node-only parts of the shared package (they use node:crypto, streams and the S3 SDK). The
 * portal imports the package's main entry, which must stay free of them.
 */
export * from './storage/s3-client';
export * from './provenance/node';
export * from './archives/check';
export * from './physics/kernel-thread';
