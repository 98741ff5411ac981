export * from './app-error';
export * from './errors';
