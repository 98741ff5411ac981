import type { Ref } from 'vue';
import { useFormDialog, type DialogForm } from './use-form-dialog';

/**
 * A form dialog that adds a record when it has none and edits it otherwise. Editing sends only
 * the changed fields, so a save never overwrites another person's edit of another field, and
 * nothing changed means nothing to save.
 */
export function useRecordDialog<Item extends { id: string }, Input, Patch extends object, Values>(opts: {
  visible: Ref<boolean>;
  form: DialogForm<Input, Values>;
  /** The record being edited, or null to add one. */
  record: () => Item | null;
  /** The form's values for a record (or for a new one). */
  formOf: (record: Item | null) => Values;
  create: (input: Input) => Promise<Item>;
  update: (id: string, patch: Patch) => Promise<Item>;
  changes: (input: Input, before: Item) => Patch;
  onSaved: (saved: Item, created: boolean) => void;
  failureTitle: string;
}) {
  async function save(input: Input): Promise<{ saved: Item; created: boolean } | null> {
    const before = opts.record();
    if (!before) return { saved: await opts.create(input), created: true };
    const patch = opts.changes(input, before);
    return Object.keys(patch).length ? { saved: await opts.update(before.id, patch), created: false } : null;
  }

  return useFormDialog({
    visible: opts.visible,
    form: opts.form,
    initial: () => opts.formOf(opts.record()),
    save,
    onSaved: ({ saved, created }) => opts.onSaved(saved, created),
    failureTitle: opts.failureTitle,
  });
}
