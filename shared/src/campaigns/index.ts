export * from './campaign-spec.schema';
export * from './cost-model';
export * from './pilot-fit';
export * from './notices';
export * from './estimate-report';
export * from './campaign.schema';
export * from './example-spec';
