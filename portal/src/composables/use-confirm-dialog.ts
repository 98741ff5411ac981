import { useConfirm } from 'primevue/useconfirm';

export interface AskOptions {
  header: string;
  message: string;
  acceptLabel: string;
  rejectLabel?: string;
  /** Destructive actions get a red accept button. */
  danger?: boolean;
}

/** ConfirmationService as a promise: `if (await ask(...))`. Closing the dialog counts as "no". */
export function useConfirmDialog() {
  const confirm = useConfirm();
  return function ask(options: AskOptions): Promise<boolean> {
    return new Promise((resolve) => {
      confirm.require({
        header: options.header,
        message: options.message,
        icon: options.danger ? 'pi pi-exclamation-triangle' : 'pi pi-question-circle',
        acceptProps: { label: options.acceptLabel, severity: options.danger ? 'danger' : undefined },
        rejectProps: { label: options.rejectLabel ?? 'Cancel', severity: 'secondary', outlined: true },
        defaultFocus: 'reject',
        accept: () => resolve(true),
        reject: () => resolve(false),
        onHide: () => resolve(false),
      });
    });
  };
}
