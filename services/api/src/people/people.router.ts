import { IdParams, Person, PersonInput, PersonListQuery, PersonPage, PersonPatch, Role } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import type { PeopleService } from './people.service';
import { createPeopleController } from './people.controller';

const RoleParams = IdParams.extend({ role: Role });

export function peopleRoutes(service: PeopleService) {
  const c = createPeopleController(service);
  return defineRoutes([
    {
      method: 'get', path: '/people', tag: 'people', summary: 'People, paged, sorted and filtered (format=csv for all rows)',
      access: access.read(['admin']), request: { query: PersonListQuery },
      responses: { 200: { description: 'A page of people; with format=csv, every matching row as text/csv', schema: PersonPage } }, handler: c.list,
    },
    {
      method: 'post', path: '/people', tag: 'people', summary: 'Add a person (they link their account at first sign-in)',
      access: access.admin(), request: { body: PersonInput }, responses: { 201: { description: 'Added', schema: Person } }, handler: c.create,
    },
    {
      method: 'get', path: '/people/:id', tag: 'people', summary: 'One person (admins: anyone; others: themselves)',
      access: access.read(), request: { params: IdParams }, responses: { 200: { description: 'The person', schema: Person } }, handler: c.get,
    },
    {
      method: 'patch', path: '/people/:id', tag: 'people', summary: 'Change name, institution or active state',
      access: access.admin(), request: { params: IdParams, body: PersonPatch }, responses: { 200: { description: 'Updated', schema: Person } }, handler: c.update,
    },
    {
      method: 'put', path: '/people/:id/roles/:role', tag: 'people', summary: 'Grant a role (repeating it changes nothing)',
      access: access.admin(), request: { params: RoleParams }, responses: { 200: { description: 'The person with the role', schema: Person } }, handler: c.grantRole,
    },
    {
      method: 'delete', path: '/people/:id/roles/:role', tag: 'people', summary: 'Revoke a role',
      access: access.admin(), request: { params: RoleParams }, responses: { 200: { description: 'The person without the role', schema: Person } }, handler: c.revokeRole,
    },
  ]);
}
