export * from './notification.schema';
