import { onBeforeUnmount, watch, type Ref } from 'vue';
import { onBeforeRouteLeave } from 'vue-router';
import { useConfirmDialog } from './use-confirm-dialog';

/**
 * Guards a form with unsaved changes: closing its dialog or leaving the page asks first, and
 * the browser warns before a reload or tab close. Returns `confirmDiscard()` for close buttons.
 */
export function useDirtyGuard(isDirty: Ref<boolean>) {
  const ask = useConfirmDialog();

  async function confirmDiscard(): Promise<boolean> {
    if (!isDirty.value) return true;
    return ask({
      header: 'Discard your changes?',
      message: 'This form has changes that are not saved. Closing it loses them.',
      acceptLabel: 'Discard changes',
      rejectLabel: 'Keep editing',
      danger: true,
    });
  }

  function onBeforeUnload(event: BeforeUnloadEvent): void {
    event.preventDefault();
  }

  watch(
    isDirty,
    (dirty) => {
      if (dirty) window.addEventListener('beforeunload', onBeforeUnload);
      else window.removeEventListener('beforeunload', onBeforeUnload);
    },
    { immediate: true },
  );
  onBeforeUnmount(() => window.removeEventListener('beforeunload', onBeforeUnload));
  onBeforeRouteLeave(() => confirmDiscard());

  return { confirmDiscard };
}
