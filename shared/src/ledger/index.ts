export * from './ledger-math';
export * from './ledger.schema';
