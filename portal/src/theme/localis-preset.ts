import { definePreset } from '@primeuix/themes';
import Aura from '@primeuix/themes/aura';

/**
 * Localis' own preset on top of Aura: a deep teal primary, warm stone surfaces and amber for
 * warnings. Text colours are chosen so every pair used by our screens meets WCAG 2.1 AA
 * (4.5:1) in light and dark; several Aura defaults (muted text on surface.100, .600 message
 * text on .50, white on .500 buttons) fall short of that, so they are overridden here.
 */
const teal = {
  50: '#f0f9f8',
  100: '#d9f0ed',
  200: '#b3e0db',
  300: '#80c9c1',
  400: '#4dada3',
  500: '#2b9187',
  600: '#1f766e',
  700: '#1a5f59',
  800: '#174d49',
  900: '#15403d',
  950: '#0a2725',
};

const stone = {
  0: '#ffffff',
  50: '{stone.50}',
  100: '{stone.100}',
  200: '{stone.200}',
  300: '{stone.300}',
  400: '{stone.400}',
  500: '{stone.500}',
  600: '{stone.600}',
  700: '{stone.700}',
  800: '{stone.800}',
  900: '{stone.900}',
  950: '{stone.950}',
};

/** Severity colours of toasts and inline messages; warnings are amber. */
function lightSeverity(color: string) {
  return {
    background: `{${color}.50}`,
    borderColor: `{${color}.300}`,
    color: `{${color}.800}`,
    detailColor: '{surface.700}',
    closeButton: { hoverBackground: `{${color}.100}`, focusRing: { color: `{${color}.800}`, shadow: 'none' } },
    outlined: { color: `{${color}.800}`, borderColor: `{${color}.700}` },
    simple: { color: `{${color}.800}` },
  };
}

function darkSeverity(color: string) {
  return {
    background: `color-mix(in srgb, {${color}.500}, transparent 84%)`,
    borderColor: `color-mix(in srgb, {${color}.400}, transparent 50%)`,
    color: `{${color}.300}`,
    detailColor: '{surface.100}',
    closeButton: { hoverBackground: 'rgba(255, 255, 255, 0.05)', focusRing: { color: `{${color}.300}`, shadow: 'none' } },
    outlined: { color: `{${color}.300}`, borderColor: `{${color}.300}` },
    simple: { color: `{${color}.300}` },
  };
}

function solidButton(bg: string, hover: string, active: string, fg: string) {
  return {
    background: bg,
    hoverBackground: hover,
    activeBackground: active,
    borderColor: bg,
    hoverBorderColor: hover,
    activeBorderColor: active,
    color: fg,
    hoverColor: fg,
    activeColor: fg,
    focusRing: { color: bg, shadow: 'none' },
  };
}

const severities = { success: 'green', info: 'sky', warn: 'amber', error: 'red' } as const;
const mapSeverities = (fn: (c: string) => object) =>
  Object.fromEntries(Object.entries(severities).map(([k, c]) => [k, fn(c)]));

export const LocalisPreset = definePreset(Aura, {
  primitive: { teal },
  semantic: {
    primary: {
      50: '{teal.50}',
      100: '{teal.100}',
      200: '{teal.200}',
      300: '{teal.300}',
      400: '{teal.400}',
      500: '{teal.500}',
      600: '{teal.600}',
      700: '{teal.700}',
      800: '{teal.800}',
      900: '{teal.900}',
      950: '{teal.950}',
    },
    colorScheme: {
      light: {
        surface: stone,
        primary: { color: '{primary.700}', contrastColor: '#ffffff', hoverColor: '{primary.800}', activeColor: '{primary.900}' },
        highlight: {
          background: '{primary.50}',
          focusBackground: '{primary.100}',
          color: '{primary.800}',
          focusColor: '{primary.900}',
        },
        text: { color: '{surface.800}', hoverColor: '{surface.900}', mutedColor: '{surface.600}', hoverMutedColor: '{surface.700}' },
        formField: {
          color: '{surface.800}',
          borderColor: '{surface.400}',
          hoverBorderColor: '{surface.500}',
          placeholderColor: '{surface.500}',
          floatLabelColor: '{surface.600}',
          floatLabelActiveColor: '{surface.600}',
          floatLabelFocusColor: '{primary.700}',
        },
      },
      dark: {
        surface: stone,
        primary: { color: '{primary.300}', contrastColor: '{surface.950}', hoverColor: '{primary.200}', activeColor: '{primary.100}' },
        highlight: {
          background: 'color-mix(in srgb, {primary.300}, transparent 82%)',
          focusBackground: 'color-mix(in srgb, {primary.300}, transparent 72%)',
          color: '{surface.0}',
          focusColor: '{surface.0}',
        },
        text: { color: '{surface.100}', hoverColor: '{surface.0}', mutedColor: '{surface.400}', hoverMutedColor: '{surface.300}' },
        formField: {
          background: '{surface.950}',
          color: '{surface.100}',
          borderColor: '{surface.500}',
          hoverBorderColor: '{surface.400}',
          placeholderColor: '{surface.400}',
          floatLabelColor: '{surface.400}',
          floatLabelActiveColor: '{surface.400}',
        },
      },
    },
  },
  components: {
    toast: { colorScheme: { light: mapSeverities(lightSeverity), dark: mapSeverities(darkSeverity) } },
    message: { colorScheme: { light: mapSeverities(lightSeverity), dark: mapSeverities(darkSeverity) } },
    tag: {
      colorScheme: {
        light: {
          success: { background: '{green.100}', color: '{green.800}' },
          info: { background: '{sky.100}', color: '{sky.800}' },
          warn: { background: '{amber.100}', color: '{amber.800}' },
          danger: { background: '{red.100}', color: '{red.800}' },
          secondary: { background: '{surface.200}', color: '{surface.700}' },
          primary: { background: '{primary.100}', color: '{primary.800}' },
        },
        dark: {
          warn: { background: 'color-mix(in srgb, {amber.500}, transparent 84%)', color: '{amber.300}' },
          secondary: { background: '{surface.700}', color: '{surface.200}' },
        },
      },
    },
    badge: {
      colorScheme: {
        light: { warn: { background: '{amber.700}', color: '#ffffff' }, danger: { background: '{red.700}', color: '#ffffff' } },
        dark: { warn: { background: '{amber.400}', color: '{amber.950}' } },
      },
    },
    button: {
      colorScheme: {
        light: {
          root: {
            success: solidButton('{green.700}', '{green.800}', '{green.900}', '#ffffff'),
            info: solidButton('{sky.700}', '{sky.800}', '{sky.900}', '#ffffff'),
            warn: solidButton('{amber.700}', '{amber.800}', '{amber.900}', '#ffffff'),
            danger: solidButton('{red.700}', '{red.800}', '{red.900}', '#ffffff'),
          },
          outlined: {
            secondary: { hoverBackground: '{surface.100}', activeBackground: '{surface.200}', borderColor: '{surface.400}', color: '{surface.700}' },
            danger: { hoverBackground: '{red.50}', activeBackground: '{red.100}', borderColor: '{red.300}', color: '{red.700}' },
            warn: { hoverBackground: '{amber.50}', activeBackground: '{amber.100}', borderColor: '{amber.300}', color: '{amber.800}' },
          },
          text: {
            danger: { hoverBackground: '{red.50}', activeBackground: '{red.100}', color: '{red.700}' },
            warn: { hoverBackground: '{amber.50}', activeBackground: '{amber.100}', color: '{amber.800}' },
          },
        },
        dark: {
          root: { warn: solidButton('{amber.400}', '{amber.300}', '{amber.200}', '{amber.950}') },
          outlined: {
            secondary: { hoverBackground: 'rgba(255,255,255,0.04)', activeBackground: 'rgba(255,255,255,0.08)', borderColor: '{surface.500}', color: '{surface.200}' },
            warn: { hoverBackground: 'rgba(255,255,255,0.04)', activeBackground: 'rgba(255,255,255,0.08)', borderColor: '{amber.700}', color: '{amber.300}' },
          },
          text: { warn: { hoverBackground: 'rgba(255,255,255,0.04)', activeBackground: 'rgba(255,255,255,0.08)', color: '{amber.300}' } },
        },
      },
    },
  },
});

/** The class on <html> that switches PrimeVue and our own styles to the dark scheme. */
export const DARK_CLASS = 'localis-dark';
