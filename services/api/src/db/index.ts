export * from './database';
export * from './migrator';
export * from './models';
