import { z } from 'zod';
import { listQuery, page } from '../lists';

export const GroupMember = z.object({
  personId: z.uuid(),
  name: z.string(),
  email: z.email(),
  joinedAt: z.iso.datetime(),
});
export type GroupMember = z.infer<typeof GroupMember>;

export const ResearchGroup = z
  .object({
    id: z.uuid(),
    name: z.string(),
    institutionId: z.uuid(),
    institutionName: z.string(),
    piPersonId: z.uuid(),
    piName: z.string(),
    memberCount: z.number().int(),
    createdAt: z.iso.datetime(),
  })
  .meta({ id: 'ResearchGroup' });
export type ResearchGroup = z.infer<typeof ResearchGroup>;

export const ResearchGroupDetail = ResearchGroup.extend({ members: z.array(GroupMember) }).meta({
  id: 'ResearchGroupDetail',
});
export type ResearchGroupDetail = z.infer<typeof ResearchGroupDetail>;

export const ResearchGroupInput = z
  .object({
    name: z.string().trim().min(2, 'name needs at least 2 characters').max(200),
    institutionId: z.uuid('choose an institution'),
    piPersonId: z.uuid('choose the PI'),
  })
  .meta({ id: 'ResearchGroupInput' });
export type ResearchGroupInput = z.infer<typeof ResearchGroupInput>;

export const GroupMemberInput = z.object({ personId: z.uuid('choose a person') }).meta({ id: 'GroupMemberInput' });
export type GroupMemberInput = z.infer<typeof GroupMemberInput>;

export const ResearchGroupListQuery = listQuery(['name', 'institutionName', 'createdAt'], {
  q: z.string().trim().max(100).optional(),
  institutionId: z.uuid().optional(),
  mine: z.enum(['true', 'false']).transform((v) => v === 'true').optional(),
}, 'name');
export type ResearchGroupListQuery = z.infer<typeof ResearchGroupListQuery>;

export const ResearchGroupPage = page(ResearchGroup).meta({ id: 'ResearchGroupPage' });
