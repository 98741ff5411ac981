import { CampaignSpec, estimateReport, type EstimateReport } from '@localis/shared';
import { onScopeDispose, ref, shallowRef, watch } from 'vue';
import { fieldErrors, typeErrorMap } from '../../../composables/use-zod-form';
import { TYPE_MESSAGES } from '../lib/campaign-form-values';

/** Long enough that typing "128" is one estimate, short enough to feel immediate. */
export const ESTIMATE_DELAY_MS = 250;

const context = { error: typeErrorMap(TYPE_MESSAGES) };

/**
 * The estimate and notices of the specification being edited, computed in the browser by the
 * same pure function the server runs on save. It follows every valid change after a short pause;
 * while the specification is not valid it keeps the last estimate (`stale`) and gives the
 * specification's errors, keyed like the form's ('spec.disorder.step').
 */
export function useLiveEstimate(specInput: () => unknown, delayMs = ESTIMATE_DELAY_MS) {
  const report = shallowRef<EstimateReport | null>(null);
  const specErrors = ref<Record<string, string>>({});
  const stale = ref(false);
  let timer: ReturnType<typeof setTimeout> | undefined;

  function run(): void {
    timer = undefined;
    const result = CampaignSpec.safeParse(specInput(), context);
    if (!result.success) {
      specErrors.value = fieldErrors(result.error.issues.map((i) => ({ ...i, path: ['spec', ...i.path] })), true);
      stale.value = report.value !== null;
      return;
    }
    specErrors.value = {};
    try {
      report.value = estimateReport(result.data);
      stale.value = false;
    } catch (error) {
      // A spec the schema accepts should always have an estimate; if not, say so rather than show old numbers as new.
      console.error(error);
      stale.value = report.value !== null;
    }
  }

  /** Computes now (first paint, before saving) instead of after the pause. */
  function flush(): void {
    clearTimeout(timer);
    run();
  }

  watch(
    () => JSON.stringify(specInput() ?? null),
    () => {
      clearTimeout(timer);
      timer = setTimeout(run, delayMs);
    },
  );
  onScopeDispose(() => clearTimeout(timer));
  run();

  return { report, specErrors, stale, flush };
}
