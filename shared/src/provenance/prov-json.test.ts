import { describe, expect, it } from 'vitest';
import { EXAMPLE_CAMPAIGN_ID, exampleIds as id, exampleRecords } from './provenance-example.fixture';
import { PROVENANCE_NAMESPACE, ProvenanceRecord } from './provenance.schema';
import { provAttributeName, toProvJson } from './prov-json';

const person = { $: 'prov:Person', type: 'xsd:QName' };
const software = { $: 'prov:SoftwareAgent', type: 'xsd:QName' };

/** The worked example as PROV-JSON, written out in full, in the order the document lists it. */
const expected = {
  prefix: { localis: PROVENANCE_NAMESPACE },
  entity: {
    [id.grant]: { 'prov:label': 'Grant of 500000 core-hours', 'localis:coreHours': 500000, 'localis:round': '2026-B' },
    [id.campaign]: { 'prov:label': 'Critical exponent of the 3D Anderson transition' },
    [id.run1]: { 'prov:label': 'Run L=12, W=16.5', 'localis:systemSize': 12, 'localis:disorder': 16.5, 'localis:archived': true },
    [id.run2]: { 'prov:label': 'Run L=16, W=16.5', 'localis:systemSize': 16, 'localis:disorder': 16.5, 'localis:archived': true },
    [id.archive]: { 'prov:label': 'results-W16.5.tar.gz', 'localis:sha256': '5e'.repeat(32), 'localis:sizeBytes': 1048576, 'localis:format': 'tar.gz' },
  },
  activity: {
    [id.decision]: {
      'prov:label': 'Allocation decision, round 2026-B',
      'prov:startTime': '2026-11-01T14:00:00.000Z',
      'prov:endTime': '2026-11-02T09:00:00.000Z',
      'localis:decision': 'approved',
    },
    [id.simulation1]: { 'prov:label': 'Transfer-matrix simulation L=12', 'prov:startTime': '2026-11-10T08:00:00.000Z', 'prov:endTime': '2026-11-11T02:00:00.000Z' },
    [id.simulation2]: { 'prov:label': 'Transfer-matrix simulation L=16', 'prov:startTime': '2026-11-10T08:00:00.000Z', 'prov:endTime': '2026-11-11T07:00:00.000Z' },
    [id.upload]: { 'prov:label': 'Upload and verification', 'prov:startTime': '2026-11-12T16:00:00.000Z', 'prov:endTime': '2026-11-12T16:30:00.000Z' },
  },
  agent: {
    [id.chair]: { 'prov:label': 'Ines Okafor', 'prov:type': person },
    [id.committee]: { 'prov:label': 'Allocation committee', 'prov:type': { $: 'prov:Organization', type: 'xsd:QName' } },
    [id.solver]: { 'prov:label': 'transfer-matrix 2.1.0', 'prov:type': software },
    [id.researcher]: { 'prov:label': 'Mateo Lindqvist', 'prov:type': person },
    [id.verifier]: { 'prov:label': 'localis-verifier 1.0.0', 'prov:type': software },
  },
  used: {
    '_:u1': { 'prov:activity': id.decision, 'prov:entity': id.campaign },
    '_:u2': { 'prov:activity': id.simulation1, 'prov:entity': id.grant },
    '_:u3': { 'prov:activity': id.simulation2, 'prov:entity': id.grant },
  },
  wasGeneratedBy: {
    '_:g1': { 'prov:entity': id.grant, 'prov:activity': id.decision },
    '_:g2': { 'prov:entity': id.run1, 'prov:activity': id.simulation1 },
    '_:g3': { 'prov:entity': id.run2, 'prov:activity': id.simulation2 },
    '_:g4': { 'prov:entity': id.archive, 'prov:activity': id.upload },
  },
  wasAssociatedWith: {
    '_:a1': { 'prov:activity': id.decision, 'prov:agent': id.chair, 'prov:role': 'chair' },
    '_:a2': { 'prov:activity': id.decision, 'prov:agent': id.committee },
    '_:a3': { 'prov:activity': id.simulation1, 'prov:agent': id.solver, 'prov:role': 'solver' },
    '_:a4': { 'prov:activity': id.simulation1, 'prov:agent': id.researcher, 'prov:role': 'submitter' },
    '_:a5': { 'prov:activity': id.simulation2, 'prov:agent': id.solver, 'prov:role': 'solver' },
    '_:a6': { 'prov:activity': id.simulation2, 'prov:agent': id.researcher, 'prov:role': 'submitter' },
    '_:a7': { 'prov:activity': id.upload, 'prov:agent': id.researcher, 'prov:role': 'uploader' },
    '_:a8': { 'prov:activity': id.upload, 'prov:agent': id.verifier, 'prov:role': 'verifier' },
  },
  wasDerivedFrom: {
    '_:d1': { 'prov:generatedEntity': id.archive, 'prov:usedEntity': id.run1 },
    '_:d2': { 'prov:generatedEntity': id.archive, 'prov:usedEntity': id.run2 },
  },
};

describe('toProvJson', () => {
  it('the worked example is made of valid records', () => {
    for (const record of exampleRecords) expect(ProvenanceRecord.parse(record)).toEqual(record);
  });

  it('writes the worked example (an archive of two runs under a grant) as this exact PROV-JSON', () => {
    const doc = toProvJson(exampleRecords);
    expect(doc).toStrictEqual(expected);
    // Same keys in the same order: the document is byte-for-byte reproducible.
    expect(JSON.stringify(doc)).toBe(JSON.stringify(expected));
  });

  it('gives an empty document for no records', () => {
    expect(toProvJson([])).toStrictEqual({
      prefix: { localis: PROVENANCE_NAMESPACE },
      entity: {},
      activity: {},
      agent: {},
      used: {},
      wasGeneratedBy: {},
      wasAssociatedWith: {},
      wasDerivedFrom: {},
    });
  });

  it('merges a node named in several records, later records winning, and writes a repeated relation once', () => {
    const base: ProvenanceRecord = { ...exampleRecords[3], used: [], wasAssociatedWith: [], wasGeneratedBy: [] };
    const withdrawn: ProvenanceRecord = {
      v: 1,
      kind: 'archive-withdrawn',
      campaignId: EXAMPLE_CAMPAIGN_ID,
      at: '2026-12-01T10:00:00.000Z',
      entities: [{ id: id.archive, label: 'results-W16.5.tar.gz (withdrawn)', attributes: { withdrawn: true, format: 'tar' } }],
      activities: [{ id: id.upload, label: 'Upload and verification', attributes: {} }],
      agents: [],
      used: [],
      wasGeneratedBy: [],
      wasAssociatedWith: [],
      wasDerivedFrom: [{ generated: id.archive, used: id.run1 }],
    };
    const doc = toProvJson([base, withdrawn]);
    expect(doc.entity[id.archive]).toStrictEqual({
      'prov:label': 'results-W16.5.tar.gz (withdrawn)',
      'localis:sha256': '5e'.repeat(32),
      'localis:sizeBytes': 1048576,
      'localis:format': 'tar',
      'localis:withdrawn': true,
    });
    // A later mention without times keeps the times already known.
    expect(doc.activity[id.upload]['prov:startTime']).toBe('2026-11-12T16:00:00.000Z');
    expect(Object.keys(doc.wasDerivedFrom)).toEqual(['_:d1', '_:d2']);
  });

  it('numbers blank nodes by log order, so reordering records renumbers them', () => {
    const reversed = toProvJson([...exampleRecords].reverse());
    expect(reversed.wasGeneratedBy['_:g1']).toEqual({ 'prov:entity': id.archive, 'prov:activity': id.upload });
    expect(toProvJson(exampleRecords)).toStrictEqual(toProvJson(exampleRecords));
  });

  it('qualifies attribute names in the localis namespace unless they are qualified already', () => {
    expect(provAttributeName('sha256')).toBe('localis:sha256');
    expect(provAttributeName('prov:value')).toBe('prov:value');
  });
});
