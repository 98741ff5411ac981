import { IdParams, SpotCheckList } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import type { SpotChecksService } from './spot-checks.service';
import { createSpotChecksController } from './spot-checks.controller';

export function spotChecksRoutes(service: SpotChecksService) {
  const c = createSpotChecksController(service);
  return defineRoutes([
    {
      method: 'get', path: '/campaigns/:id/spot-checks', tag: 'analyses',
      summary: "Reproducibility spot-checks of the campaign's verified archives, newest first: a few points of each archive's smallest size recomputed with the transfer-matrix kernel, each difference in combined standard errors",
      access: access.read(['researcher', 'pi', 'committee', 'admin']), request: { params: IdParams }, responses: { 200: { description: 'The spot-checks', schema: SpotCheckList } }, handler: c.list,
    },
  ]);
}
