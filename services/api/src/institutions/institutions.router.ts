import { IdParams, Institution, InstitutionInput, InstitutionListQuery, InstitutionPage, InstitutionPatch } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import type { InstitutionsService } from './institutions.service';
import { createInstitutionsController } from './institutions.controller';

export function institutionsRoutes(service: InstitutionsService) {
  const c = createInstitutionsController(service);
  return defineRoutes([
    {
      method: 'get', path: '/institutions', tag: 'institutions', summary: 'Member and partner institutions (billing e-mails only for admins and the own billing contacts)',
      access: access.read(), request: { query: InstitutionListQuery }, responses: { 200: { description: 'A page', schema: InstitutionPage } }, handler: c.list,
    },
    {
      method: 'get', path: '/institutions/:id', tag: 'institutions', summary: 'One institution',
      access: access.read(), request: { params: IdParams }, responses: { 200: { description: 'The institution', schema: Institution } }, handler: c.get,
    },
    {
      method: 'post', path: '/institutions', tag: 'institutions', summary: 'Add an institution',
      access: access.admin(), request: { body: InstitutionInput }, responses: { 201: { description: 'Added', schema: Institution } }, handler: c.create,
    },
    {
      method: 'patch', path: '/institutions/:id', tag: 'institutions', summary: 'Change an institution',
      access: access.admin(), request: { params: IdParams, body: InstitutionPatch }, responses: { 200: { description: 'Updated', schema: Institution } }, handler: c.update,
    },
  ]);
}
