import { computed, ref } from 'vue';
import { DARK_CLASS } from '../theme/localis-preset';

export type ColorScheme = 'light' | 'dark';

const STORAGE_KEY = 'localis-color-scheme';

function storedScheme(): ColorScheme | null {
  try {
    const value = window.localStorage.getItem(STORAGE_KEY);
    return value === 'light' || value === 'dark' ? value : null;
  } catch {
    return null; // storage may be disabled; the system preference still applies
  }
}

function systemScheme(): ColorScheme {
  return window.matchMedia?.('(prefers-color-scheme: dark)').matches ? 'dark' : 'light';
}

const scheme = ref<ColorScheme>('light');

function apply(next: ColorScheme): void {
  scheme.value = next;
  document.documentElement.classList.toggle(DARK_CLASS, next === 'dark');
}

/** Called once before mount so the first paint already has the right scheme. */
export function initColorScheme(): void {
  apply(storedScheme() ?? systemScheme());
  // Until the person picks one, follow the system as it changes (e.g. at dusk).
  window.matchMedia?.('(prefers-color-scheme: dark)').addEventListener?.('change', (event) => {
    if (!storedScheme()) apply(event.matches ? 'dark' : 'light');
  });
}

export function useColorScheme() {
  function toggle(): void {
    const next: ColorScheme = scheme.value === 'dark' ? 'light' : 'dark';
    try {
      window.localStorage.setItem(STORAGE_KEY, next);
    } catch {
      // Not remembered, but still applied for this visit.
    }
    apply(next);
  }
  return { scheme, isDark: computed(() => scheme.value === 'dark'), toggle };
}
