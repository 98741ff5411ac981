import { computed, ref, watch, type Ref } from 'vue';
import { useApiErrorToast } from './use-api-error-toast';
import { useDirtyGuard } from './use-dirty-guard';

/** The part of a `useZodForm` form a dialog drives. */
export interface DialogForm<Input, Values> {
  dirty: Ref<boolean>;
  validate(): Input | null;
  reset(next?: Values): void;
  applyServerErrors(error: unknown): boolean;
}

/**
 * The life of a form in a dialog: a fresh form each time it opens, a question before unsaved
 * changes are closed away, and a submit that validates with the shared schema, saves, closes,
 * or keeps the dialog open with the server's errors beside the fields and in a toast.
 */
export function useFormDialog<Input, Values, Saved>(opts: {
  visible: Ref<boolean>;
  form: DialogForm<Input, Values>;
  /** The values a fresh form starts from (default: the form's own initial values). */
  initial?: () => Values;
  /** Saves and returns what was saved, or null when there was nothing to save. */
  save: (input: Input) => Promise<Saved | null>;
  onSaved: (saved: Saved) => void;
  failureTitle: string;
}) {
  const { visible, form } = opts;
  const saving = ref(false);
  const showApiError = useApiErrorToast();
  const { confirmDiscard } = useDirtyGuard(computed(() => visible.value && form.dirty.value));

  watch(visible, (open) => {
    if (open) form.reset(opts.initial?.());
  });

  async function close(): Promise<void> {
    if (await confirmDiscard()) visible.value = false;
  }

  async function submit(): Promise<void> {
    const input = form.validate();
    if (!input) return;
    saving.value = true;
    try {
      const saved = await opts.save(input);
      visible.value = false;
      if (saved !== null) opts.onSaved(saved);
    } catch (error) {
      form.applyServerErrors(error);
      showApiError(error, opts.failureTitle);
    } finally {
      saving.value = false;
    }
  }

  return { saving, close, submit };
}
