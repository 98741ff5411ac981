import type { ProvenanceRecord } from './provenance.schema';

/**
 * A worked example of the log: a grant decision, two runs made under that grant by a simulation
 * code, and an archive of both runs, uploaded by a researcher and checked by the verifier.
 */

export const EXAMPLE_CAMPAIGN_ID = '6b1f3c52-8d4e-4a7b-9c21-0e5d7f8a9b10';

export const exampleIds = {
  campaign: `localis:campaign/${EXAMPLE_CAMPAIGN_ID}`,
  grant: 'localis:grant/2d9c4e61-7a3b-4f5c-8e1d-3b6a9c0d2e41',
  decision: 'localis:grant-decision/2d9c4e61-7a3b-4f5c-8e1d-3b6a9c0d2e41',
  chair: 'localis:person/9e8d7c6b-5a4f-4e3d-8c2b-1a0f9e8d7c6b',
  committee: 'localis:organization/allocation-committee',
  researcher: 'localis:person/4c3b2a19-0f8e-4d7c-9b6a-5f4e3d2c1b0a',
  solver: 'localis:code/transfer-matrix@2.1.0',
  verifier: 'localis:code/localis-verifier@1.0.0',
  run1: 'localis:run/a1b2c3d4-e5f6-4a7b-8c9d-0e1f2a3b4c5d',
  run2: 'localis:run/b2c3d4e5-f6a7-4b8c-9d0e-1f2a3b4c5d6e',
  simulation1: 'localis:simulation/a1b2c3d4-e5f6-4a7b-8c9d-0e1f2a3b4c5d',
  simulation2: 'localis:simulation/b2c3d4e5-f6a7-4b8c-9d0e-1f2a3b4c5d6e',
  archive: 'localis:archive/c3d4e5f6-a7b8-4c9d-8e0f-2a3b4c5d6e7f',
  upload: 'localis:upload/c3d4e5f6-a7b8-4c9d-8e0f-2a3b4c5d6e7f',
} as const;

const id = exampleIds;

const grantDecided: ProvenanceRecord = {
  v: 1,
  kind: 'grant-decided',
  campaignId: EXAMPLE_CAMPAIGN_ID,
  at: '2026-11-02T09:00:00.000Z',
  entities: [
    { id: id.grant, label: 'Grant of 500000 core-hours', attributes: { coreHours: 500000, round: '2026-B' } },
    { id: id.campaign, label: 'Critical exponent of the 3D Anderson transition', attributes: {} },
  ],
  activities: [{ id: id.decision, label: 'Allocation decision, round 2026-B', startedAt: '2026-11-01T14:00:00.000Z', endedAt: '2026-11-02T09:00:00.000Z', attributes: { decision: 'approved' } }],
  agents: [
    { id: id.chair, label: 'Ines Okafor', kind: 'person', attributes: {} },
    { id: id.committee, label: 'Allocation committee', kind: 'organization', attributes: {} },
  ],
  used: [{ activity: id.decision, entity: id.campaign }],
  wasGeneratedBy: [{ entity: id.grant, activity: id.decision }],
  wasAssociatedWith: [
    { activity: id.decision, agent: id.chair, role: 'chair' },
    { activity: id.decision, agent: id.committee },
  ],
  wasDerivedFrom: [],
};

function runRecorded(run: string, simulation: string, systemSize: number, at: string): ProvenanceRecord {
  return {
    v: 1,
    kind: 'run-recorded',
    campaignId: EXAMPLE_CAMPAIGN_ID,
    at,
    entities: [
      { id: run, label: `Run L=${systemSize}, W=16.5`, attributes: { systemSize, disorder: 16.5 } },
      { id: id.grant, label: 'Grant of 500000 core-hours', attributes: {} },
    ],
    activities: [{ id: simulation, label: `Transfer-matrix simulation L=${systemSize}`, startedAt: '2026-11-10T08:00:00.000Z', endedAt: at, attributes: {} }],
    agents: [
      { id: id.solver, label: 'transfer-matrix 2.1.0', kind: 'software', attributes: {} },
      { id: id.researcher, label: 'Mateo Lindqvist', kind: 'person', attributes: {} },
    ],
    used: [{ activity: simulation, entity: id.grant }],
    wasGeneratedBy: [{ entity: run, activity: simulation }],
    wasAssociatedWith: [
      { activity: simulation, agent: id.solver, role: 'solver' },
      { activity: simulation, agent: id.researcher, role: 'submitter' },
    ],
    wasDerivedFrom: [],
  };
}

const archiveVerified: ProvenanceRecord = {
  v: 1,
  kind: 'archive-verified',
  campaignId: EXAMPLE_CAMPAIGN_ID,
  at: '2026-11-12T16:30:00.000Z',
  entities: [
    { id: id.archive, label: 'results-W16.5.tar.gz', attributes: { sha256: '5e'.repeat(32), sizeBytes: 1048576, format: 'tar.gz' } },
    // The runs again, now known to be archived: their attributes merge with the run records'.
    { id: id.run1, label: 'Run L=12, W=16.5', attributes: { archived: true } },
    { id: id.run2, label: 'Run L=16, W=16.5', attributes: { archived: true } },
  ],
  activities: [{ id: id.upload, label: 'Upload and verification', startedAt: '2026-11-12T16:00:00.000Z', endedAt: '2026-11-12T16:30:00.000Z', attributes: {} }],
  agents: [
    { id: id.researcher, label: 'Mateo Lindqvist', kind: 'person', attributes: {} },
    { id: id.verifier, label: 'localis-verifier 1.0.0', kind: 'software', attributes: {} },
  ],
  used: [],
  wasGeneratedBy: [{ entity: id.archive, activity: id.upload }],
  wasAssociatedWith: [
    { activity: id.upload, agent: id.researcher, role: 'uploader' },
    { activity: id.upload, agent: id.verifier, role: 'verifier' },
  ],
  wasDerivedFrom: [
    { generated: id.archive, used: id.run1 },
    { generated: id.archive, used: id.run2 },
  ],
};

/** The example log, in log order. */
export const exampleRecords: ProvenanceRecord[] = [
  grantDecided,
  runRecorded(id.run1, id.simulation1, 12, '2026-11-11T02:00:00.000Z'),
  runRecorded(id.run2, id.simulation2, 16, '2026-11-11T07:00:00.000Z'),
  archiveVerified,
];
