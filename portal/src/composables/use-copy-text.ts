import { useToast } from 'primevue/usetoast';

/**
 * Puts a text on the clipboard and says so in a toast. Outside a secure page, or when the
 * browser refuses, the toast shows the text to select by hand: it is on the page as well.
 */
export function useCopyText() {
  const toast = useToast();
  return async function copyText(text: string, copied: { summary: string; detail: string }): Promise<void> {
    try {
      await navigator.clipboard.writeText(text);
      toast.add({ severity: 'success', summary: copied.summary, detail: copied.detail, life: 3000 });
    } catch {
      toast.add({ severity: 'warn', summary: 'Could not copy', detail: `Select it instead: ${text}`, life: 8000 });
    }
  };
}
