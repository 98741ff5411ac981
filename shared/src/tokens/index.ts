export * from './api-token.schema';
