export * from './run.schema';
export * from './run-import';
