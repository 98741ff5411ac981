import { useToast } from 'primevue/usetoast';
import { isApiError } from '../api/api-error';
import { isAbort } from '../stores/latest-only';

/**
 * Shows a failed call as a toast with the server's own message. Anything that is not an
 * ApiError is a bug in the portal: it is logged and shown in general words.
 */
export function useApiErrorToast() {
  const toast = useToast();
  return function showApiError(error: unknown, summary = 'That did not work'): void {
    if (isAbort(error)) return;
    if (!isApiError(error)) console.error(error);
    const detail = isApiError(error)
      ? error.message
      : 'Something went wrong in the portal. Reload the page and try again.';
    toast.add({ severity: 'error', summary, detail, life: 8000 });
  };
}
