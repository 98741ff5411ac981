export * from './group.schema';
