// The pure half of provenance, safe in the browser. Hashing and signing (node:crypto) are in ./node.
export * from './provenance.schema';
export * from './prov-json';
export * from './lineage';
