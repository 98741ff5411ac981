import { SessionInfo, type SignOutResult } from '@localis/shared';
import { ApiError } from './api-error';
import { apiUrl, http } from './http-client';

export const sessionApi = {
  /** GET /session. Parsed, because a wrong answer here (say, an HTML page) must not look like a session. */
  async get(): Promise<SessionInfo> {
    const body = await http.get<unknown>('/session');
    const parsed = SessionInfo.safeParse(body);
    if (!parsed.success) throw new ApiError(200, 'malformed', 'The server sent a session Localis could not read.');
    return parsed.data;
  },

  /** POST /auth/logout: ends our session; `endSessionUrl` ends the identity provider's one too. */
  signOut: () => http.post<SignOutResult>('/auth/logout'),

  /** Where the browser goes to sign in: a full page load through the identity provider. */
  loginUrl: (redirect: string) => apiUrl('/auth/login', { redirect }),
};
