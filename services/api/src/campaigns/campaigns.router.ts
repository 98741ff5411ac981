import { Campaign, CampaignInput, CampaignListQuery, CampaignPage, CampaignPatch, CampaignSpec, EstimateReportSchema, IdParams, TransitionNote } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import type { CampaignsService } from './campaigns.service';
import { createCampaignsController } from './campaigns.controller';

const PROPOSERS = ['researcher', 'pi'] as const;
const READERS = ['researcher', 'pi', 'committee', 'admin'] as const;

export function campaignsRoutes(service: CampaignsService) {
  const c = createCampaignsController(service);
  return defineRoutes([
    {
      method: 'post', path: '/estimates', tag: 'campaigns', summary: 'Core-hours, memory and scaling-theory notices of a campaign specification; nothing is stored',
      access: access.read(), request: { body: CampaignSpec }, responses: { 200: { description: 'The estimate', schema: EstimateReportSchema } }, handler: c.estimate,
    },
    {
      method: 'get', path: '/campaigns', tag: 'campaigns', summary: 'Campaigns you may see (scope=mine|my-groups|all; filters state, roundId, groupId, method, dimension, symmetryClass, q)',
      access: access.read([...READERS]), request: { query: CampaignListQuery }, responses: { 200: { description: 'A page', schema: CampaignPage } }, handler: c.list,
    },
    {
      method: 'post', path: '/campaigns', tag: 'campaigns', summary: 'Draft a campaign in one of your groups',
      access: access.write([...PROPOSERS]), request: { body: CampaignInput }, responses: { 201: { description: 'The draft', schema: Campaign } }, handler: c.create,
    },
    {
      method: 'get', path: '/campaigns/:id', tag: 'campaigns', summary: 'One campaign with its estimate, notices and history',
      access: access.read([...READERS]), request: { params: IdParams }, responses: { 200: { description: 'The campaign', schema: Campaign } }, handler: c.get,
    },
    {
      method: 'patch', path: '/campaigns/:id', tag: 'campaigns', summary: "Edit a draft (its owner or the group's PI)",
      access: access.write([...PROPOSERS]), request: { params: IdParams, body: CampaignPatch }, responses: { 200: { description: 'The draft', schema: Campaign } }, handler: c.update,
    },
    {
      method: 'post', path: '/campaigns/:id/submit', tag: 'campaigns', summary: "Submit a draft to the round (the group's PI, while the round is open)",
      access: access.write(['pi']), request: { params: IdParams, body: TransitionNote }, responses: { 200: { description: 'Submitted', schema: Campaign } }, handler: c.submit,
    },
    {
      method: 'post', path: '/campaigns/:id/withdraw', tag: 'campaigns', summary: "Withdraw a campaign before its decision (its owner or the group's PI)",
      access: access.write([...PROPOSERS]), request: { params: IdParams, body: TransitionNote }, responses: { 200: { description: 'Withdrawn', schema: Campaign } }, handler: c.withdraw,
    },
    {
      method: 'post', path: '/campaigns/:id/start-review', tag: 'campaigns', summary: 'Put a submitted proposal in review with the committee',
      access: access.admin(), request: { params: IdParams, body: TransitionNote }, responses: { 200: { description: 'In review', schema: Campaign } }, handler: c.startReview,
    },
  ]);
}
