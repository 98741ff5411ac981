import type { z } from 'zod';
import { computed, ref, watch, type Ref } from 'vue';
import { isApiError } from '../api/api-error';

type Issue = { path: readonly PropertyKey[]; message: string };

/**
 * The field an issue belongs to. Flat forms use the top-level key. Nested forms use the dotted
 * path up to the first list index ('spec.disorder.step'; ['spec', 'sizes', 2] is 'spec.sizes'),
 * because a list is edited in one input and its error stands beside that input.
 */
export function errorKey(path: readonly PropertyKey[], nested = false): string {
  if (path.length === 0) return '_form';
  if (!nested) return String(path[0]);
  const keys: string[] = [];
  for (const segment of path) {
    if (typeof segment === 'number') break;
    keys.push(String(segment));
  }
  return keys.length > 0 ? keys.join('.') : '_form';
}

/** First message per field, from zod issues or the server's `details` (see `errorKey`). */
export function fieldErrors(issues: readonly Issue[], nested = false): Record<string, string> {
  const errors: Record<string, string> = {};
  for (const issue of issues) {
    errors[errorKey(issue.path, nested)] ??= issue.message;
  }
  return errors;
}

export interface ZodFormOptions<V> {
  /** Errors keyed by dotted paths of nested fields (see `errorKey`), not only top-level ones. */
  nested?: boolean;
  /**
   * What the schema checks, made from what the inputs edit: text boxes give strings, the schema
   * wants numbers and lists. Defaults to the values themselves.
   */
  toInput?: (values: V) => unknown;
  /**
   * Words for a field left empty or not a number, where its schema has no message of its own
   * (zod's defaults speak of types: "expected number, received NaN").
   */
  typeMessages?: TypeMessages;
}

export interface TypeMessages {
  blank: string;
  notANumber: string;
  /** Better words for particular empty fields, by their dotted path ('machine': 'choose the machine'). */
  blankByField?: Record<string, string>;
}

/** A per-parse zod error map that says `typeMessages` in place of zod's type wording. */
export function typeErrorMap(messages: TypeMessages) {
  return (issue: { code: string; input?: unknown; path?: PropertyKey[] }): string | undefined => {
    if (issue.code !== 'invalid_type') return undefined;
    if (issue.input === undefined || issue.input === null) return messages.blankByField?.[errorKey(issue.path ?? [], true)] ?? messages.blank;
    return typeof issue.input === 'number' && Number.isNaN(issue.input) ? messages.notANumber : undefined;
  };
}

/**
 * A form checked by the same zod schema the server uses. `V` is the shape the inputs edit
 * (what PrimeVue's v-models produce); `validate()` returns the schema's output or null and fills
 * `errors`. After the first attempt, errors follow the values as the person fixes them.
 */
export function useZodForm<S extends z.ZodType, V extends object>(schema: S, initial: () => V, options: ZodFormOptions<V> = {}) {
  const values = ref(initial()) as Ref<V>;
  const errors = ref<Record<string, string>>({});
  const attempted = ref(false);
  let snapshot = JSON.stringify(values.value);

  const dirty = computed(() => JSON.stringify(values.value) !== snapshot);

  const { nested = false, toInput = (v: V): unknown => v, typeMessages } = options;
  const context = typeMessages ? { error: typeErrorMap(typeMessages) } : undefined;

  /** The schema's verdict on the current values, without touching `errors`. */
  function parse() {
    return schema.safeParse(toInput(values.value), context);
  }

  function check(): z.output<S> | null {
    const result = parse();
    errors.value = result.success ? {} : fieldErrors(result.error.issues, nested);
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
    errors.value = { ...errors.value, ...fieldErrors(error.details, nested) };
    return true;
  }

  /** Starts over from new values, which count as saved. */
  function reset(next: V = initial()): void {
    values.value = next;
    snapshot = JSON.stringify(next);
    errors.value = {};
    attempted.value = false;
  }

  return { values, errors, dirty, attempted, validate, parse, applyServerErrors, reset };
}
