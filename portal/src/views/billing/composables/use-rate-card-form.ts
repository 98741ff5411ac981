import type { RateCard } from '@localis/shared';
import { computed, ref, watch } from 'vue';
import { isApiError } from '../../../api/api-error';
import { useZodForm } from '../../../composables/use-zod-form';
import { emptyTier, rateCardFormOf, RateCardFormSchema, tierErrors } from '../lib/rate-card-form';

type Issue = { path: readonly PropertyKey[]; message: string };

/**
 * The new-rate-card form: checked by RateCardInput (through the conversion of typed prices and
 * percentages), with the tier rows' errors beside each row. The server's 422 details land beside
 * their fields; its 409 (a card must start after the latest one) beside the start date.
 */
export function useRateCardForm(latest: () => RateCard | null) {
  const form = useZodForm(RateCardFormSchema, () => rateCardFormOf(latest()));
  const serverIssues = ref<Issue[]>([]);

  watch(form.values, () => (serverIssues.value = []), { deep: true });

  const tiers = computed(() => {
    const checked = Object.keys(form.errors.value).length > 0;
    if (!checked && serverIssues.value.length === 0) return tierErrors([]);
    const parsed = checked ? form.parse() : null;
    // The server's word first: it knows what the schema cannot.
    return tierErrors([...serverIssues.value, ...(parsed && !parsed.success ? parsed.error.issues : [])]);
  });

  function addTier(): void {
    form.values.value.tiers.push(emptyTier());
  }

  function removeTier(index: number): void {
    form.values.value.tiers.splice(index, 1);
  }

  function applyServerErrors(error: unknown): boolean {
    const applied = form.applyServerErrors(error);
    serverIssues.value = isApiError(error) ? error.details.map((d) => ({ path: [...d.path], message: d.message })) : [];
    // The only conflict this form can cause is a start on or before the latest card's.
    if (isApiError(error) && error.code === 'conflict') {
      form.errors.value = { ...form.errors.value, effectiveFrom: error.message };
      return true;
    }
    return applied;
  }

  return { form: { ...form, applyServerErrors }, values: form.values, errors: form.errors, tiers, addTier, removeTier };
}
