import type { z } from 'zod';
import { computed, ref, watch, type Ref } from 'vue';
import { isApiError } from '../api/api-error';

/** First message per top-level field, from zod issues or the server's `details`. */
export function fieldErrors(issues: readonly { path: readonly PropertyKey[]; message: string }[]): Record<string, string> {
  const errors: Record<string, string> = {};
  for (const issue of issues) {
    const key = issue.path.length > 0 ? String(issue.path[0]) : '_form';
    errors[key] ??= issue.message;
  }
  return errors;
}

/**
 * A form checked by the same zod schema the server uses. `V` is the shape the inputs edit
 * (what PrimeVue's v-models produce); `validate()` returns the schema's output or null and fills
 * `errors`. After the first attempt, errors follow the values as the person fixes them.
 */
export function useZodForm<S extends z.ZodType, V extends object>(schema: S, initial: () => V) {
  const values = ref(initial()) as Ref<V>;
  const errors = ref<Record<string, string>>({});
  const attempted = ref(false);
  let snapshot = JSON.stringify(values.value);

  const dirty = computed(() => JSON.stringify(values.value) !== snapshot);

  function check(): z.output<S> | null {
    const result = schema.safeParse(values.value);
    errors.value = result.success ? {} : fieldErrors(result.error.issues);
    return result.success ? result.data : null;
  }

  function validate(): z.output<S> | null {
    attempted.value = true;
    return check();
  }

  watch(values, () => {
    if (attempted.value) check();
  }, { deep: true });

  /** Puts a 422's per-field details beside the fields. True when there were any. */
  function applyServerErrors(error: unknown): boolean {
    if (!isApiError(error) || error.details.length === 0) return false;
    errors.value = { ...errors.value, ...fieldErrors(error.details) };
    return true;
  }

  /** Starts over from new values, which count as saved. */
  function reset(next: V = initial()): void {
    values.value = next;
    snapshot = JSON.stringify(next);
    errors.value = {};
    attempted.value = false;
  }

  return { values, errors, dirty, validate, applyServerErrors, reset };
}
