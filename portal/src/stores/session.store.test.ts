import { createPinia, setActivePinia } from 'pinia';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createApp } from 'vue';
import { resetAllStores, resetPlugin } from './reset-plugin';
import { useSessionStore } from './session.store';

const person = {
  id: '0b6f0c7e-4a53-4f2e-9d0e-6b7c8d9e0f11',
  name: 'Ilse Varga-Moreau',
  email: 'ilse.varga@brennmoor.example',
  institutionId: null,
  roles: ['researcher', 'admin'],
};

function answer(body: unknown, status = 200): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });
}

describe('useSessionStore', () => {
  let fetchMock: ReturnType<typeof vi.fn>;

  beforeEach(() => {
    const pinia = createPinia();
    pinia.use(resetPlugin);
    createApp({}).use(pinia); // plugins apply only to a pinia installed in an app
    setActivePinia(pinia);
    fetchMock = vi.fn();
    vi.stubGlobal('fetch', fetchMock);
  });

  afterEach(() => {
    vi.unstubAllGlobals();
  });

  describe('load', () => {
    it('should ask the server once when loaded twice', async () => {
      fetchMock.mockResolvedValue(answer({ signedIn: true, person, csrfToken: 'c1' }));
      const session = useSessionStore();

      await Promise.all([session.load(), session.load()]);
      await session.load();

      expect(fetchMock).toHaveBeenCalledOnce();
      expect(session.signedIn).toBe(true);
      expect(session.csrfToken).toBe('c1');
      expect(session.mailInboxUrl).toBeNull();
      expect(session.hasRole('admin')).toBe(true);
      expect(session.hasRole('billing')).toBe(false);
    });

    it('should act signed out and keep the reason when the server cannot be reached', async () => {
      fetchMock.mockRejectedValue(new TypeError('Failed to fetch'));
      const session = useSessionStore();

      await session.load();

      expect(session.loaded).toBe(true);
      expect(session.signedIn).toBe(false);
      expect(session.loadError).toMatch(/cannot reach/);
    });

    it('should refuse an answer that is not a session when the server sends an HTML page', async () => {
      fetchMock.mockResolvedValue(answer({ hello: 'world' }));
      const session = useSessionStore();

      await session.load();

      expect(session.signedIn).toBe(false);
      expect(session.loadError).not.toBeNull();
    });
  });

  describe('reset on sign-out', () => {
    it('should forget the person and load again when all stores are reset', async () => {
      fetchMock.mockResolvedValueOnce(answer({ signedIn: true, person, csrfToken: 'c1' }));
      const session = useSessionStore();
      await session.load();

      resetAllStores();

      expect(session.signedIn).toBe(false);
      expect(session.person).toBeNull();
      expect(session.loaded).toBe(false);
      fetchMock.mockResolvedValueOnce(answer({ signedIn: false, person: null, csrfToken: 'c2' }));
      await session.load();
      expect(fetchMock).toHaveBeenCalledTimes(2);
      expect(session.csrfToken).toBe('c2');
    });
  });
});
