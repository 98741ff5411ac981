export * from './review.schema';
