import { IdParams, Round, RoundInput, RoundListQuery, RoundPage, RoundPatch } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import type { RoundsService } from './rounds.service';
import { createRoundsController } from './rounds.controller';

export function roundsRoutes(service: RoundsService) {
  const c = createRoundsController(service);
  return defineRoutes([
    {
      method: 'get', path: '/rounds', tag: 'rounds', summary: 'Allocation rounds with their pools per machine (status=open: taking proposals now)',
      access: access.read(), request: { query: RoundListQuery }, responses: { 200: { description: 'A page', schema: RoundPage } }, handler: c.list,
    },
    {
      method: 'get', path: '/rounds/:id', tag: 'rounds', summary: 'One round',
      access: access.read(), request: { params: IdParams }, responses: { 200: { description: 'The round', schema: Round } }, handler: c.get,
    },
    {
      method: 'post', path: '/rounds', tag: 'rounds', summary: 'Open a round: dates and a pool of core-hours per machine',
      access: access.admin(), request: { body: RoundInput }, responses: { 201: { description: 'Created', schema: Round } }, handler: c.create,
    },
    {
      method: 'patch', path: '/rounds/:id', tag: 'rounds', summary: 'Change a round (pools in use by campaigns stay)',
      access: access.admin(), request: { params: IdParams, body: RoundPatch }, responses: { 200: { description: 'Updated', schema: Round } }, handler: c.update,
    },
  ]);
}
