import { fitPilotTimings, parsePilotCsv, pilotSetProblems, type ErrorDetail, type PilotFit, type PilotTiming } from '@localis/shared';
import { computed, ref, type Ref } from 'vue';

/** A pilot CSV has a header and at most a few hundred short lines; anything far larger is the wrong file. */
export const MAX_PILOT_FILE_BYTES = 256 * 1024;

export const PILOT_CSV_EXAMPLE = 'size,seconds,cores\n8,42,64\n12,310,64\n16,1300,64';

/**
 * Pilot timings for the campaign form: read from a pasted text or a chosen file with the shared
 * parser, kept in the spec only when they can be fitted, and fitted for the form to show. A file
 * with problems leaves the timings already in the spec as they were.
 */
export function usePilotImport(timings: Ref<PilotTiming[]>) {
  const text = ref('');
  const problems = ref<ErrorDetail[]>([]);
  /** What the last read did, for a polite status line. */
  const status = ref('');

  const fit = computed<PilotFit | null>(() =>
    timings.value.length > 0 && pilotSetProblems(timings.value).length === 0 ? fitPilotTimings(timings.value) : null,
  );

  function read(source: string, from = 'the pasted text'): boolean {
    const result = parsePilotCsv(source);
    if (result.problems.length > 0) {
      problems.value = result.problems;
      status.value = `The pilot timings in ${from} were not used: ${result.problems.length === 1 ? 'one problem' : `${result.problems.length} problems`} below.`;
      return false;
    }
    timings.value = result.timings;
    problems.value = [];
    status.value = `Read ${result.timings.length} pilot timings from ${from}.`;
    return true;
  }

  /** Reads what was pasted into the text box. */
  function readText(): boolean {
    return read(text.value);
  }

  /** Reads a chosen file; its text also goes into the box, to be seen and corrected there. */
  async function readFile(file: File): Promise<boolean> {
    if (file.size > MAX_PILOT_FILE_BYTES) {
      problems.value = [{ path: ['pilotTimings'], message: `the file ${file.name} is ${Math.ceil(file.size / 1024)} KiB; a pilot CSV is a few lines (at most ${MAX_PILOT_FILE_BYTES / 1024} KiB). Choose the pilot timings file.` }];
      status.value = `${file.name} was not used.`;
      return false;
    }
    const content = await file.text();
    text.value = content;
    return read(content, file.name);
  }

  function remove(): void {
    timings.value = [];
    problems.value = [];
    text.value = '';
    status.value = 'Pilot timings removed: the estimate uses the default rate again.';
  }

  /** Problems as lines for the field's error text. */
  const problemLines = computed(() => problems.value.map((p) => p.message.charAt(0).toUpperCase() + p.message.slice(1)));

  return { text, problems, problemLines, status, fit, readText, readFile, remove };
}
