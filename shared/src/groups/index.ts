export * from './group.schema';
export * from './group-roles';
