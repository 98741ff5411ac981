export * from './institution.schema';
