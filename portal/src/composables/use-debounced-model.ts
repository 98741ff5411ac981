import { onBeforeUnmount, ref, watch } from 'vue';

/**
 * A text box bound to a URL filter: typing updates the box at once and the filter after a
 * pause, so each keystroke does not reload the table. Outside changes (back button, "clear")
 * flow back into the box.
 */
export function useDebouncedModel(source: () => string | undefined, commit: (value: string) => void, delayMs = 350) {
  const text = ref(source() ?? '');
  let timer: ReturnType<typeof setTimeout> | undefined;

  watch(source, (value) => {
    if (timer === undefined) text.value = value ?? '';
  });

  function onInput(value: string | undefined): void {
    text.value = value ?? '';
    clearTimeout(timer);
    timer = setTimeout(() => {
      timer = undefined;
      commit(text.value.trim());
    }, delayMs);
  }

  function flush(): void {
    if (timer === undefined) return;
    clearTimeout(timer);
    timer = undefined;
    commit(text.value.trim());
  }

  onBeforeUnmount(() => clearTimeout(timer));
  return { text, onInput, flush };
}
