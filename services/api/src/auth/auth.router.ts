import { z } from 'zod';
import { ErrorBody, SessionInfo, SignOutResult } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import type { AuthController } from './auth.controller';

const redirectResponse = { 302: { description: 'Redirect to the identity provider or back to the portal' } };

export function authRoutes(c: AuthController) {
  return defineRoutes([
    {
      method: 'get', path: '/session', tag: 'session', summary: 'Who is signed in, and the CSRF token for writes',
      access: access.public, responses: { 200: { description: 'The session', schema: SessionInfo } }, handler: c.session,
    },
    {
      method: 'get', path: '/auth/login', tag: 'session', summary: 'Start sign-in with the identity provider (authorization code flow with PKCE)',
      access: access.public, signIn: true,
      request: { query: z.object({ redirect: z.string().optional().describe('a path of the portal to return to') }) },
      responses: { ...redirectResponse, 429: { description: 'Too many sign-in attempts', schema: ErrorBody } }, handler: c.login,
    },
    {
      method: 'get', path: '/auth/callback', tag: 'session', summary: 'Where the identity provider sends the browser back',
      access: access.public, signIn: true,
      responses: { ...redirectResponse, 429: { description: 'Too many sign-in attempts', schema: ErrorBody } }, handler: c.callback,
    },
    {
      method: 'post', path: '/auth/logout', tag: 'session', summary: 'Sign out: end the session, and return the provider sign-out address',
      access: access.read(), responses: { 200: { description: 'Signed out', schema: SignOutResult } }, handler: c.logout,
    },
  ]);
}
