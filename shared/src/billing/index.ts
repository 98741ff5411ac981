export * from './currency';
export * from './rate-card.schema';
export * from './invoice.schema';
export * from './invoice-math';
