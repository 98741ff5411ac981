import { Analysis, AnalysisList, AnalysisRequest, IdParams } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import type { AnalysesService } from './analyses.service';
import { createAnalysesController } from './analyses.controller';

const READERS = ['researcher', 'pi', 'committee', 'admin'] as const;

export function analysesRoutes(service: AnalysesService) {
  const c = createAnalysesController(service);
  return defineRoutes([
    {
      method: 'get', path: '/campaigns/:id/analyses', tag: 'analyses', summary: "A campaign's scaling analyses, newest first (queued, running with progress, done with the result, or failed with the reason)",
      access: access.read([...READERS]), request: { params: IdParams }, responses: { 200: { description: 'The analyses', schema: AnalysisList } }, handler: c.list,
    },
    {
      method: 'get', path: '/analyses/:id', tag: 'analyses', summary: 'One scaling analysis',
      access: access.read([...READERS]), request: { params: IdParams }, responses: { 200: { description: 'The analysis', schema: Analysis } }, handler: c.get,
    },
    {
      method: 'post', path: '/campaigns/:id/analyses', tag: 'analyses', summary: "Run the scaling analysis again on the campaign's verified archives, with other orders, sizes or bootstrap (the group or the office)",
      access: access.write(['researcher', 'pi', 'admin']), request: { params: IdParams, body: AnalysisRequest }, responses: { 202: { description: 'Queued', schema: Analysis } }, handler: c.request,
    },
  ]);
}
