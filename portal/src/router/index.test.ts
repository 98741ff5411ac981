import { createPinia, setActivePinia } from 'pinia';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createMemoryHistory } from 'vue-router';
import { createAppRouter } from './index';

function session(roles: string[] | null) {
  const body = roles
    ? { signedIn: true, person: { id: '0b6f0c7e-4a53-4f2e-9d0e-6b7c8d9e0f11', name: 'A B', email: 'a@b.example', institutionId: null, roles }, csrfToken: 'c' }
    : { signedIn: false, person: null, csrfToken: 'c' };
  return new Response(JSON.stringify(body), { status: 200, headers: { 'content-type': 'application/json' } });
}

describe('createAppRouter', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
  });

  afterEach(() => {
    vi.unstubAllGlobals();
  });

  describe('the guard', () => {
    it('should send a signed-out person to sign-in with the page as redirect', async () => {
      vi.stubGlobal('fetch', vi.fn().mockResolvedValue(session(null)));
      const router = createAppRouter(createMemoryHistory());

      await router.push('/admin/people?role=pi');

      expect(router.currentRoute.value.name).toBe('sign-in');
      expect(router.currentRoute.value.query.redirect).toBe('/admin/people?role=pi');
      expect(document.title).toBe('Sign in · Localis');
    });

    it('should show not-allowed when the person lacks the role', async () => {
      vi.stubGlobal('fetch', vi.fn().mockResolvedValue(session(['researcher'])));
      const router = createAppRouter(createMemoryHistory());

      await router.push('/admin/audit');

      expect(router.currentRoute.value.name).toBe('not-allowed');
      expect(router.currentRoute.value.query.from).toBe('/admin/audit');
    });

    it('should let an admin in and set the title when the role is held', async () => {
      vi.stubGlobal('fetch', vi.fn().mockResolvedValue(session(['admin'])));
      const router = createAppRouter(createMemoryHistory());

      await router.push('/admin/institutions');

      expect(router.currentRoute.value.name).toBe('admin-institutions');
      expect(document.title).toBe('Institutions · Localis');
    });

    it('should load the session once across navigations', async () => {
      const fetchMock = vi.fn().mockImplementation(() => Promise.resolve(session(['researcher'])));
      vi.stubGlobal('fetch', fetchMock);
      const router = createAppRouter(createMemoryHistory());

      await router.push('/');
      await router.push('/profile');
      await router.push('/no/such/page');

      expect(fetchMock).toHaveBeenCalledOnce();
      expect(router.currentRoute.value.name).toBe('not-found');
    });
  });
});
