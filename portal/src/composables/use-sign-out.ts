import { ref } from 'vue';
import { useRouter } from 'vue-router';
import { resetAllStores } from '../stores/reset-plugin';
import { useSessionStore } from '../stores/session.store';
import { useApiErrorToast } from './use-api-error-toast';
import { confirmLeavingForms } from './use-dirty-guard';
import { pauseAllUploads } from '../views/campaigns/composables/use-archive-upload';

function isHttpUrl(value: string): boolean {
  try {
    const url = new URL(value);
    return url.protocol === 'https:' || url.protocol === 'http:';
  } catch {
    return false;
  }
}

/** Ends the session, forgets everything the stores held, then leaves through the identity provider. */
export function useSignOut() {
  const session = useSessionStore();
  const router = useRouter();
  const showApiError = useApiErrorToast();
  const signingOut = ref(false);

  async function signOut(): Promise<void> {
    // Unsaved changes are asked about before the session ends: "keep editing" keeps both.
    if (!(await confirmLeavingForms())) return;
    signingOut.value = true;
    try {
      // Parts must not go on being sent for a person who has left; the uploads stay resumable.
      pauseAllUploads();
      const result = await session.signOut();
      resetAllStores();
      if (result.endSessionUrl && isHttpUrl(result.endSessionUrl)) window.location.assign(result.endSessionUrl);
      else await router.push({ name: 'signed-out' });
    } catch (error) {
      showApiError(error, 'Sign-out did not complete');
    } finally {
      signingOut.value = false;
    }
  }

  return { signOut, signingOut };
}
