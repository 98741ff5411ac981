import type { ProvenanceEntry, ProvenanceRecord } from '@localis/shared';
import { CAMPAIGN_ID } from './archive-store-fake';

/** The provenance of one verified archive: two runs under a grant, uploaded by a researcher and checked. */
export const VERIFIED_ARCHIVE_ID = '7c1d2e3f-4a5b-4c6d-8e7f-9a0b1c2d3e4f';

export const provIds = {
  archive: `localis:archive/${VERIFIED_ARCHIVE_ID}`,
  upload: `localis:upload/${VERIFIED_ARCHIVE_ID}`,
  run12: 'localis:run/a1b2c3d4-e5f6-4a7b-8c9d-0e1f2a3b4c5d',
  run16: 'localis:run/b2c3d4e5-f6a7-4b8c-9d0e-1f2a3b4c5d6e',
  sim12: 'localis:simulation/a1b2c3d4-e5f6-4a7b-8c9d-0e1f2a3b4c5d',
  sim16: 'localis:simulation/b2c3d4e5-f6a7-4b8c-9d0e-1f2a3b4c5d6e',
  grant: 'localis:grant/2d9c4e61-7a3b-4f5c-8e1d-3b6a9c0d2e41',
  researcher: 'localis:person/4c3b2a19-0f8e-4d7c-9b6a-5f4e3d2c1b0a',
  solver: 'localis:code/tmm-kernel@1.4.2',
  verifier: 'localis:code/localis-verifier@1.0.0',
} as const;

const id = provIds;

function run(runId: string, simulation: string, size: number): ProvenanceRecord {
  return {
    v: 1,
    kind: 'run-recorded',
    campaignId: CAMPAIGN_ID,
    at: '2027-02-01T20:00:00.000Z',
    entities: [
      { id: runId, label: `Run L=${size}, W=16.5`, attributes: {} },
      { id: id.grant, label: 'Grant of 500000 core-hours', attributes: {} },
    ],
    activities: [{ id: simulation, label: `Transfer-matrix simulation L=${size}`, attributes: {} }],
    agents: [
      { id: id.solver, label: 'tmm-kernel 1.4.2', kind: 'software', attributes: {} },
      { id: id.researcher, label: 'Ilse Marrow', kind: 'person', attributes: {} },
    ],
    used: [{ activity: simulation, entity: id.grant }],
    wasGeneratedBy: [{ entity: runId, activity: simulation }],
    wasAssociatedWith: [
      { activity: simulation, agent: id.solver },
      { activity: simulation, agent: id.researcher },
    ],
    wasDerivedFrom: [],
  };
}

const verified: ProvenanceRecord = {
  v: 1,
  kind: 'archive-verified',
  campaignId: CAMPAIGN_ID,
  at: '2027-03-01T09:21:00.000Z',
  entities: [{ id: id.archive, label: 'wc-sweep-L8-16.tar.gz', attributes: {} }],
  activities: [{ id: id.upload, label: 'Upload and check', attributes: {} }],
  agents: [
    { id: id.researcher, label: 'Ilse Marrow', kind: 'person', attributes: {} },
    { id: id.verifier, label: 'localis-verifier 1.0.0', kind: 'software', attributes: {} },
  ],
  used: [],
  wasGeneratedBy: [{ entity: id.archive, activity: id.upload }],
  wasAssociatedWith: [
    { activity: id.upload, agent: id.researcher },
    { activity: id.upload, agent: id.verifier },
  ],
  wasDerivedFrom: [
    { generated: id.archive, used: id.run12 },
    { generated: id.archive, used: id.run16 },
  ],
};

export const lineageRecords: ProvenanceRecord[] = [run(id.run12, id.sim12, 12), run(id.run16, id.sim16, 16), verified];

/** The records as GET /campaigns/:id/provenance lists them. */
export function provenanceEntries(records: ProvenanceRecord[] = lineageRecords): ProvenanceEntry[] {
  return records.map((record, i) => ({
    id: String(i + 1),
    leafIndex: i,
    kind: record.kind,
    campaignId: CAMPAIGN_ID,
    subjectId: record.entities[0].id,
    record,
    content: JSON.stringify(record),
    leafHash: String(i).padStart(64, '0'),
    createdAt: record.at,
  }));
}
