// The provenance log's Merkle tree and tree-head signing: node:crypto, so for the api and worker only.
export * from './merkle';
export * from './tree-head-signing';
