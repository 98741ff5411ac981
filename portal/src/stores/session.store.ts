import type { Role, SessionPerson, SignOutResult } from '@localis/shared';
import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import { isApiError } from '../api/api-error';
import { sessionApi } from '../api/session.api';

export const useSessionStore = defineStore('session', () => {
  const loaded = ref(false);
  const signedIn = ref(false);
  const person = ref<SessionPerson | null>(null);
  const csrfToken = ref<string | null>(null);
  /** The demo mail fake's inbox, given to admins by the demo and test stacks. */
  const mailInboxUrl = ref<string | null>(null);
  /** Set when the session could not be learned at all (server down): the app then acts signed out. */
  const loadError = ref<string | null>(null);

  let pending: Promise<void> | null = null;

  const roles = computed<Role[]>(() => person.value?.roles ?? []);

  function hasRole(role: Role): boolean {
    return roles.value.includes(role);
  }

  async function fetchSession(): Promise<void> {
    try {
      const info = await sessionApi.get();
      signedIn.value = info.signedIn && info.person !== null;
      person.value = info.person;
      csrfToken.value = info.csrfToken;
      mailInboxUrl.value = info.mailInboxUrl;
      loadError.value = null;
    } catch (error) {
      signedIn.value = false;
      person.value = null;
      mailInboxUrl.value = null;
      loadError.value = isApiError(error) ? error.message : 'The session could not be loaded.';
    } finally {
      loaded.value = true;
    }
  }

  /** Loads the session once; later calls reuse it unless `force` is set. Never throws. */
  function load(force = false): Promise<void> {
    if (loaded.value && !force) return Promise.resolve();
    pending ??= fetchSession().finally(() => {
      pending = null;
    });
    return pending;
  }

  /** Ends the session on the server. Resetting stores and moving the browser is the caller's job. */
  function signOut(): Promise<SignOutResult> {
    return sessionApi.signOut();
  }

  return { loaded, signedIn, person, csrfToken, mailInboxUrl, loadError, roles, hasRole, load, signOut };
});
