import { GroupMemberInput, IdParams, ResearchGroupDetail, ResearchGroupInput, ResearchGroupListQuery, ResearchGroupPage } from '@localis/shared';
import { z } from 'zod';
import { access, defineRoutes } from '../http/route-registry';
import type { GroupsService } from './groups.service';
import { createGroupsController } from './groups.controller';

const MemberParams = IdParams.extend({ personId: z.uuid('the person id in the address is not a valid UUID') });

export function groupsRoutes(service: GroupsService) {
  const c = createGroupsController(service);

  return defineRoutes([
    {
      method: 'get', path: '/groups', tag: 'groups', summary: 'Research groups (mine=true: yours)',
      access: access.read(), request: { query: ResearchGroupListQuery }, responses: { 200: { description: 'A page', schema: ResearchGroupPage } }, handler: c.list,
    },
    {
      method: 'get', path: '/groups/:id', tag: 'groups', summary: 'One group with its members (members, its PI and admins)',
      access: access.read(), request: { params: IdParams }, responses: { 200: { description: 'The group', schema: ResearchGroupDetail } }, handler: c.get,
    },
    {
      method: 'post', path: '/groups', tag: 'groups', summary: 'Create a research group led by a PI',
      access: access.admin(), request: { body: ResearchGroupInput }, responses: { 201: { description: 'Created', schema: ResearchGroupDetail } }, handler: c.create,
    },
    {
      method: 'post', path: '/groups/:id/members', tag: 'groups', summary: "Add a member (the group's PI or an admin)",
      access: access.write(['pi', 'admin']), request: { params: IdParams, body: GroupMemberInput },
      responses: { 200: { description: 'The group', schema: ResearchGroupDetail } }, handler: c.addMember,
    },
    {
      method: 'delete', path: '/groups/:id/members/:personId', tag: 'groups', summary: "Remove a member (the group's PI or an admin)",
      access: access.write(['pi', 'admin']), request: { params: MemberParams },
      responses: { 200: { description: 'The group', schema: ResearchGroupDetail } }, handler: c.removeMember,
    },
  ]);
}
