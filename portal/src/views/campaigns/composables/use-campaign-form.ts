import { CampaignInput, type Campaign, type Round } from '@localis/shared';
import { computed, inject, provide, ref, watch, type InjectionKey, type Ref } from 'vue';
import { useRouter } from 'vue-router';
import { isApiError } from '../../../api/api-error';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';
import { useDirtyGuard } from '../../../composables/use-dirty-guard';
import { useSuccessToast } from '../../../composables/use-success-toast';
import { useZodForm } from '../../../composables/use-zod-form';
import { formatCoreHoursExact } from '../../../lib/units';
import { useCampaignsStore } from '../../../stores/campaigns.store';
import { useGroupsStore } from '../../../stores/groups.store';
import { useRoundsStore } from '../../../stores/rounds.store';
import {
  campaignFormValues,
  newCampaignValues,
  toCampaignInput,
  toCampaignPatch,
  toSpecInput,
  TYPE_MESSAGES,
  type CampaignFormValues,
} from '../lib/campaign-form-values';
import { useLiveEstimate } from './use-live-estimate';

/**
 * The campaign form's rules, for a new draft (`id` empty) and for editing one: the values and
 * their errors from the shared schema, the live estimate, the groups, rounds and machines to
 * choose from, and saving (create or patch, then on to the campaign's page).
 */
export function useCampaignForm(id: Ref<string | undefined>) {
  const campaigns = useCampaignsStore();
  const groups = useGroupsStore();
  const rounds = useRoundsStore();
  const router = useRouter();
  const showApiError = useApiErrorToast();
  const showSuccess = useSuccessToast();

  const form = useZodForm(CampaignInput, newCampaignValues, { nested: true, toInput: toCampaignInput, typeMessages: TYPE_MESSAGES });
  const { values } = form;
  const live = useLiveEstimate(() => toSpecInput(values.value.spec));
  useDirtyGuard(form.dirty);

  const editing = computed(() => Boolean(id.value));
  const loading = ref(false);
  const loadError = ref<string | null>(null);
  const saving = ref(false);
  /** The campaign being edited, as last saved. */
  const campaign = ref<Campaign | null>(null);
  /** A draft's round that no longer takes proposals still has to be shown (and its machines). */
  const ownRound = ref<Round | null>(null);

  const roundChoices = computed(() => {
    const open = rounds.open;
    return ownRound.value && !open.some((r) => r.id === ownRound.value?.id) ? [ownRound.value, ...open] : open;
  });
  const selectedRound = computed(() => roundChoices.value.find((r) => r.id === values.value.roundId) ?? null);
  const pools = computed(() => selectedRound.value?.pools ?? []);
  const selectedPool = computed(() => pools.value.find((p) => p.machine === values.value.machine) ?? null);

  // A machine belongs to a round's pools: a new round keeps it only if it has a pool there too.
  watch(
    () => values.value.roundId,
    () => {
      if (pools.value.some((p) => p.machine === values.value.machine)) return;
      values.value.machine = pools.value.length === 1 ? pools.value[0].machine : null;
    },
  );

  /** The error beside a field: the last check's, or for the specification the live one. */
  function errorOf(key: string): string | undefined {
    return form.errors.value[key] ?? (key.startsWith('spec.') ? live.specErrors.value[key] : undefined);
  }

  /** Every error the summary lists: the save attempt's, or nothing before one. */
  const allErrors = computed(() => (form.attempted.value ? { ...live.specErrors.value, ...form.errors.value } : {}));

  async function load(): Promise<void> {
    loading.value = true;
    loadError.value = null;
    try {
      const [mine, open] = await Promise.all([groups.loadMine(true), rounds.loadOpen(true)]);
      if (id.value) {
        const found = await campaigns.loadCurrent(id.value);
        if (!found) return;
        campaign.value = found;
        ownRound.value = open.some((r) => r.id === found.roundId) ? null : await rounds.get(found.roundId).catch(() => null);
        form.reset(campaignFormValues(found));
      } else {
        const fresh = newCampaignValues();
        // One group or one open round: nothing to choose, so it is chosen.
        if (mine.length === 1) fresh.groupId = mine[0].id;
        if (open.length === 1) {
          fresh.roundId = open[0].id;
          if (open[0].pools.length === 1) fresh.machine = open[0].pools[0].machine;
        }
        if (form.dirty.value) {
          // The person started typing while the lists loaded: keep their words, fill only the choices.
          const typed = form.values.value;
          typed.groupId ||= fresh.groupId;
          typed.roundId ||= fresh.roundId;
          typed.machine ||= fresh.machine;
        } else {
          form.reset(fresh);
        }
      }
      live.flush();
    } catch (error) {
      loadError.value = isApiError(error) ? error.message : 'The form could not be prepared.';
      showApiError(error, editing.value ? 'The campaign could not be loaded' : 'The form could not be prepared');
    } finally {
      loading.value = false;
    }
  }

  /** Checks with the shared schema, saves, and goes to the campaign's page. False when it stayed. */
  async function save(): Promise<boolean> {
    const input = form.validate();
    live.flush();
    if (!input) return false;
    saving.value = true;
    try {
      const saved = id.value ? await campaigns.update(id.value, toCampaignPatch(input)) : await campaigns.create(input);
      campaign.value = saved;
      // Saved values are clean: leaving for the campaign's page must not ask about losing them.
      form.reset(campaignFormValues(saved));
      showSuccess('Draft saved', `${saved.title}: ${formatCoreHoursExact(saved.requestedCoreHours)} requested.`);
      await router.push({ name: 'campaign-detail', params: { id: saved.id } });
      return true;
    } catch (error) {
      form.applyServerErrors(error);
      showApiError(error, 'The campaign was not saved');
      return false;
    } finally {
      saving.value = false;
    }
  }

  const readOnly = computed(() => (editing.value && campaign.value && !campaign.value.can.edit ? campaign.value : null));

  return {
    form,
    values,
    live,
    editing,
    loading,
    loadError,
    saving,
    campaign,
    readOnly,
    groups: computed(() => groups.mine),
    roundChoices,
    selectedRound,
    pools,
    selectedPool,
    allErrors,
    errorOf,
    load,
    save,
  };
}

export type CampaignFormContext = ReturnType<typeof useCampaignForm>;

const KEY: InjectionKey<CampaignFormContext> = Symbol('campaign-form');

/** The form view hands its form to the section components below it. */
export function provideCampaignForm(context: CampaignFormContext): void {
  provide(KEY, context);
}

export function useCampaignFormContext(): CampaignFormContext {
  const context = inject(KEY);
  if (!context) throw new Error('campaign form sections must sit inside the campaign form view');
  return context;
}

export type { CampaignFormValues };
