export * from './analysis.schema';
export * from './spot-check.schema';
