import { errors, type Profile } from '@localis/shared';
import type { RequestContext } from '../http/principal';
import { groupsRepository } from '../groups/groups.repository';
import { peopleRepository } from '../people/people.repository';

export const profileService = {
  /** The signed-in person as the profile page shows them: record, roles, groups. */
  async profileOf(ctx: RequestContext): Promise<Profile> {
    const id = ctx.principal!.personId;
    const person = await peopleRepository.findDto(id);
    if (!person) throw errors.notFound('Your account');
    return { person, groups: await groupsRepository.groupsOf(id) };
  },
};
