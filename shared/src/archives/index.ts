export * from './archive.schema';
export * from './transfer-rate';
