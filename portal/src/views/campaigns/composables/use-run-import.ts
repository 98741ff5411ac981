import { MAX_IMPORT_BYTES, RunImportRequest, type ImportMapping, type RunImportResult } from '@localis/shared';
import { computed, onBeforeUnmount, ref, watch, type Ref } from 'vue';
import { isApiError } from '../../../api/api-error';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';
import { useLedgerStore } from '../../../stores/ledger.store';
import { useRunsStore } from '../../../stores/runs.store';
import { columnChoices, commitBlockers, enabledSteps, fieldsMappedTwice, mappingToSend, type ColumnChoice, type ImportStep } from '../lib/run-import-steps';

/** A pause after a mapping change before the preview is asked again, so quick choices make one request. */
const REPREVIEW_MS = 300;

/**
 * The import wizard's state: the CSV and its defaults, the server's dry-run preview, the
 * person's column choices (each one previews again), and the commit that records every row or
 * none. Nothing is written before the commit.
 */
export function useRunImport(campaignId: Ref<string>) {
  const store = useRunsStore();
  const ledger = useLedgerStore();
  const showApiError = useApiErrorToast();

  const csv = ref('');
  const fileName = ref<string | null>(null);
  const defaults = ref({ codeName: '', codeVersion: '' });
  const chosen = ref<ImportMapping>({});
  const result = ref<RunImportResult | null>(null);
  /** Why the file could not be previewed at all, in words (not CSV, too big, refused). */
  const problem = ref<string | null>(null);
  const previewing = ref(false);
  /** The choices changed after the preview on screen: commit waits for the next one. */
  const stale = ref(false);
  const committing = ref(false);
  const committed = ref<RunImportResult | null>(null);
  const step = ref<ImportStep>('source');
  let timer: ReturnType<typeof setTimeout> | undefined;

  const choices = computed(() => (result.value ? columnChoices(result.value, chosen.value) : {}));
  const mappedTwice = computed(() => fieldsMappedTwice(choices.value));
  const blockers = computed(() => commitBlockers(result.value, choices.value, stale.value || previewing.value));
  const enabled = computed(() => enabledSteps({ hasSource: csv.value.trim() !== '', result: result.value, blockers: blockers.value, committed: committed.value !== null }));

  function request(): RunImportRequest {
    const codeName = defaults.value.codeName.trim();
    const codeVersion = defaults.value.codeVersion.trim();
    const given = {
      ...(codeName ? { codeName } : {}),
      ...(codeVersion ? { codeVersion } : {}),
    };
    const mapping = mappingToSend(chosen.value, result.value?.columns ?? Object.keys(chosen.value));
    return {
      csv: csv.value,
      ...(Object.keys(mapping).length ? { mapping } : {}),
      ...(Object.keys(given).length ? { defaults: given } : {}),
    };
  }

  /** Asks the server to check the file as it would import it; moves on to the preview step. */
  async function preview(): Promise<boolean> {
    clearTimeout(timer);
    const checked = RunImportRequest.safeParse(request());
    if (!checked.success) {
      problem.value = checked.error.issues[0]?.message ?? 'The import cannot be checked.';
      return false;
    }
    problem.value = null;
    previewing.value = true;
    try {
      const answer = await store.previewImport(campaignId.value, checked.data);
      // A newer preview is on its way; it will land instead.
      if (!answer) return false;
      result.value = answer;
      stale.value = false;
      step.value = 'preview';
      return true;
    } catch (error) {
      problem.value = isApiError(error) ? error.message : 'The file could not be checked.';
      showApiError(error, 'The file could not be checked');
      return false;
    } finally {
      previewing.value = false;
    }
  }

  // Other defaults change what the rows say: the preview on screen no longer holds.
  watch(
    defaults,
    () => {
      if (!committed.value) result.value = null;
    },
    { deep: true },
  );

  /** A new file or text: earlier choices and previews belonged to the old one. */
  function setSource(text: string, name: string | null = null): void {
    csv.value = text;
    fileName.value = name;
    chosen.value = {};
    result.value = null;
    stale.value = false;
    problem.value = null;
  }

  async function readFile(file: File): Promise<void> {
    if (file.size > MAX_IMPORT_BYTES) {
      problem.value = `${file.name} is ${(file.size / 1e6).toFixed(1)} MB; an import may be at most ${MAX_IMPORT_BYTES / 1e6} MB. Split the file and import the parts one after another.`;
      return;
    }
    setSource(await file.text(), file.name);
  }

  /** A column's field chosen: preview again after a pause, unless a field is now taken twice. */
  function choose(column: string, choice: ColumnChoice | null): void {
    const next = { ...chosen.value };
    if (choice === null) delete next[column];
    else next[column] = choice;
    chosen.value = next;
    stale.value = true;
    clearTimeout(timer);
    if (fieldsMappedTwice(columnChoices(result.value ?? { columns: [], mapping: {} }, next)).length) return;
    timer = setTimeout(() => void preview(), REPREVIEW_MS);
  }

  async function commit(): Promise<void> {
    if (blockers.value.length) return;
    committing.value = true;
    try {
      const answer = await store.commitImport(campaignId.value, request());
      committed.value = answer;
      step.value = 'commit';
      // Balances held for this campaign are out of date now.
      if (ledger.ledger?.campaignId === campaignId.value) ledger.load(campaignId.value).catch(() => undefined);
    } catch (error) {
      showApiError(error, 'The runs were not recorded');
      // Something changed since the preview (another import, a new run): show what stands now.
      if (isApiError(error) && (error.status === 409 || error.status === 422)) {
        await preview();
        step.value = 'preview';
      }
    } finally {
      committing.value = false;
    }
  }

  /** Another file after a finished import. */
  function startOver(): void {
    setSource('');
    defaults.value = { codeName: '', codeVersion: '' };
    committed.value = null;
    step.value = 'source';
  }

  onBeforeUnmount(() => clearTimeout(timer));

  return {
    csv,
    fileName,
    defaults,
    result,
    problem,
    previewing,
    stale,
    committing,
    committed,
    step,
    choices,
    mappedTwice,
    blockers,
    enabled,
    preview,
    setSource,
    readFile,
    choose,
    commit,
    startOver,
  };
}

export type RunImport = ReturnType<typeof useRunImport>;
