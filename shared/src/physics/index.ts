export * from './reference-values';
export * from './random';
export * from './transfer-matrix';
