export * from './reference-values';
