export * from './common.schema';
