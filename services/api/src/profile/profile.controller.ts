import type { Request, Response } from 'express';
import { errors, type Profile } from '@localis/shared';
import { peopleRepository } from '../people/people.repository';
import { groupsRepository } from '../groups/groups.repository';

export const profileController = {
  async me(req: Request, res: Response) {
    const p = req.principal!;
    const person = await peopleRepository.findDto(p.personId);
    if (!person) throw errors.notFound('Your account');
    const body: Profile = { person, groups: await groupsRepository.groupsOf(p.personId) };
    res.json(body);
  },
};
