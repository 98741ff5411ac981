export * from './audit.schema';
