import { IdParams, Run, RunImportQuery, RunImportRequest, RunImportResult, RunInput, RunListQuery, RunPage } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import type { RunsService } from './runs.service';
import { createRunsController } from './runs.controller';

const READERS = ['researcher', 'pi', 'committee', 'admin'] as const;
const RECORDERS = ['researcher', 'pi', 'admin'] as const;

export function runsRoutes(service: RunsService) {
  const c = createRunsController(service);
  return defineRoutes([
    {
      method: 'get', path: '/campaigns/:id/runs', tag: 'runs', summary: "A campaign's runs (filters q, codeName, from, to; format=csv)",
      access: access.read([...READERS]), request: { params: IdParams, query: RunListQuery }, responses: { 200: { description: 'A page', schema: RunPage } }, handler: c.list,
    },
    {
      method: 'post', path: '/campaigns/:id/runs', tag: 'runs', summary: "Record a run and debit the campaign's grant (group members, the PI, the office; tokens need the runs scope)",
      access: { kind: 'signed-in', scope: 'runs', roles: [...RECORDERS] }, request: { params: IdParams, body: RunInput }, responses: { 201: { description: 'The run', schema: Run } }, handler: c.create,
    },
    {
      method: 'post', path: '/campaigns/:id/runs/import', tag: 'runs', summary: "Import a scheduler's accounting CSV: dryRun=true previews (mapping, per-row errors, duplicates); otherwise all rows or none",
      access: { kind: 'signed-in', scope: 'runs', roles: [...RECORDERS] }, request: { params: IdParams, query: RunImportQuery, body: RunImportRequest },
      responses: { 200: { description: 'The preview (dryRun)', schema: RunImportResult }, 201: { description: 'Recorded', schema: RunImportResult } }, handler: c.importRuns,
    },
  ]);
}
