export * from './roles';
export * from './session.schema';
