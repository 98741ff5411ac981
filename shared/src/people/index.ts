export * from './person.schema';
