export * from './round.schema';
