import type { Profile } from '@localis/shared';
import { http } from './http-client';

export const profileApi = {
  /** GET /me: the signed-in person and their research groups. */
  get: () => http.get<Profile>('/me'),
};
