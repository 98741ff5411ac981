import { useToast } from 'primevue/usetoast';

/** A short confirmation that a change was saved. */
export function useSuccessToast() {
  const toast = useToast();
  return function showSuccess(summary: string, detail?: string): void {
    toast.add({ severity: 'success', summary, detail, life: 4000 });
  };
}
