import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import { profileService } from './profile.service';

export const profileController = {
  async me(req: Request, res: Response) {
    res.json(await profileService.profileOf(contextOf(req)));
  },
};
