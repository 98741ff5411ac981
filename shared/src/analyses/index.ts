export * from './analysis.schema';
