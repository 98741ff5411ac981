import { RoundInput, type Round } from '@localis/shared';
import { computed, ref, watch, type Ref } from 'vue';
import { isApiError } from '../../../../api/api-error';
import { useZodForm } from '../../../../composables/use-zod-form';
import { emptyPool, formOf, poolErrors, roundInputOf, type RoundForm } from './round-form';

/**
 * The round dialog's form: checked by RoundInput (the schema the api uses), with the pool rows'
 * errors placed beside each machine and amount, from the schema and from the server's details.
 */
export function useRoundForm(round: Ref<Round | null>) {
  // Empty policy fields are left out of what is checked and sent: the server's defaults apply.
  const form = useZodForm(RoundInput, (): RoundForm => formOf(round.value), { toInput: roundInputOf });
  const serverIssues = ref<{ path: PropertyKey[]; message: string }[]>([]);

  watch(form.values, () => (serverIssues.value = []), { deep: true });

  const pools = computed(() => {
    const checked = Object.keys(form.errors.value).length > 0;
    if (!checked && serverIssues.value.length === 0) return poolErrors([]);
    const parsed = checked ? form.parse() : null;
    // The server's word comes first: it knows what the schema cannot (what is already granted).
    return poolErrors([...serverIssues.value, ...(parsed && !parsed.success ? parsed.error.issues : [])]);
  });

  function addPool(): void {
    form.values.value.pools.push(emptyPool());
  }

  function removePool(index: number): void {
    form.values.value.pools.splice(index, 1);
  }

  function applyServerErrors(error: unknown): boolean {
    const applied = form.applyServerErrors(error);
    serverIssues.value = isApiError(error) ? error.details.map((d) => ({ path: [...d.path], message: d.message })) : [];
    return applied;
  }

  return { form: { ...form, applyServerErrors }, values: form.values, errors: form.errors, pools, addPool, removePool };
}
