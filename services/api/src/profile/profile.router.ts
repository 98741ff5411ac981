import { Profile } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import { profileController } from './profile.controller';

export function profileRoutes() {
  return defineRoutes([
    {
      method: 'get', path: '/me', tag: 'profile', summary: 'The signed-in person: record, roles and groups',
      access: access.read(), responses: { 200: { description: 'Profile', schema: Profile } }, handler: profileController.me,
    },
  ]);
}
