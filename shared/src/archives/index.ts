export * from './archive.schema';
