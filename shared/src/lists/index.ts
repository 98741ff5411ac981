export * from './list-query';
