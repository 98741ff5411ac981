import { onBeforeUnmount, watch, type Ref } from 'vue';
import { onBeforeRouteLeave, onBeforeRouteUpdate } from 'vue-router';
import { useConfirmDialog } from './use-confirm-dialog';

/** The guards of the forms open now, so leaving the whole app (signing out) can ask each first. */
const openGuards = new Set<() => Promise<boolean>>();

/** Asks every open form with unsaved changes; true when all may be discarded. */
export async function confirmLeavingForms(): Promise<boolean> {
  for (const confirm of [...openGuards]) if (!(await confirm())) return false;
  return true;
}

/**
 * Guards a form with unsaved changes: closing its dialog or leaving the page asks first, and
 * the browser warns before a reload or tab close. Returns `confirmDiscard()` for close buttons.
 */
export function useDirtyGuard(isDirty: Ref<boolean>) {
  const ask = useConfirmDialog();
  /** Set once the person agreed to discard, so the route guard that follows does not ask again. */
  let released = false;

  async function confirmDiscard(): Promise<boolean> {
    if (!isDirty.value || released) return true;
    released = await ask({
      header: 'Discard your changes?',
      message: 'This form has changes that are not saved. Closing it loses them.',
      acceptLabel: 'Discard changes',
      rejectLabel: 'Keep editing',
      danger: true,
    });
    // Discarded: leaving the page (the identity provider's sign-out, say) must not warn again.
    if (released) window.removeEventListener('beforeunload', onBeforeUnload);
    return released;
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
  openGuards.add(confirmDiscard);
  // A change after agreeing to discard (the person stayed after all) is guarded again.
  watch(isDirty, () => (released = false));
  onBeforeUnmount(() => {
    openGuards.delete(confirmDiscard);
    window.removeEventListener('beforeunload', onBeforeUnload);
  });
  onBeforeRouteLeave(() => confirmDiscard());
  // The same page for another record (/campaigns/A/edit -> /campaigns/B/edit) reloads the form too.
  onBeforeRouteUpdate((to, from) => (to.fullPath === from.fullPath ? true : confirmDiscard()));

  return { confirmDiscard };
}
