// Cagewright's own PrimeVue preset: cool steel blue-grey surfaces with a signal-amber primary, squarer
// corners than the base preset, and darker text tones so amber never carries body text on white.
import { definePreset } from '@primeuix/themes';
import Aura from '@primeuix/themes/aura';

/** Signal amber: reads as "caution" on the garage floor; 500 is the fill, 700+ carry text. */
export const signalAmber = {
  50: '#fff7ec',
  100: '#ffecd0',
  200: '#ffd59e',
  300: '#ffb962',
  400: '#fb9f33',
  500: '#f5921e',
  600: '#d9730b',
  700: '#a9550b',
  800: '#864310',
  900: '#6c3811',
  950: '#3b1a05',
};

/** Steel: a blue-grey with a little more blue than slate, like painted tube under shop lights. */
export const steel = {
  0: '#ffffff',
  50: '#f3f5f8',
  100: '#e5e9ef',
  200: '#cdd4de',
  300: '#aab5c4',
  400: '#8191a5',
  500: '#63738a',
  600: '#4e5c71',
  700: '#3f4a5c',
  800: '#313a48',
  900: '#242b36',
  950: '#161b22',
};

/**
 * Text tones on the light surfaces. Muted text is steel 600, not 500: 500 measured 3.96:1 on the page
 * background (steel 100), under the 4.5:1 WCAG 2.2 SC 1.4.3 asks for normal text; 600 gives 5.57:1
 * there and 6.79:1 on white. tests/unit/frontend/theme-contrast.test.ts keeps every pair above 4.5:1.
 */
export const textTokens = { color: '{surface.800}', hoverColor: '{surface.900}', mutedColor: '{surface.600}' } as const;

/** A filled button of one severity, one step darker than Aura's so white text reads at 4.5:1 or more. */
function filled(hue: string) {
  return {
    background: `{${hue}.700}`, hoverBackground: `{${hue}.800}`, activeBackground: `{${hue}.900}`,
    borderColor: `{${hue}.700}`, hoverBorderColor: `{${hue}.800}`, activeBorderColor: `{${hue}.900}`,
    focusRing: { color: `{${hue}.700}`, shadow: 'none' },
  };
}

export const CagewrightPreset = definePreset(Aura, {
  primitive: {
    borderRadius: { none: '0', xs: '2px', sm: '3px', md: '4px', lg: '6px', xl: '8px' },
  },
  semantic: {
    primary: signalAmber,
    focusRing: { width: '2px', style: 'solid', color: '{primary.600}', offset: '2px' },
    colorScheme: {
      light: {
        surface: steel,
        primary: {
          color: '{primary.500}',
          contrastColor: '{surface.950}',
          hoverColor: '{primary.400}',
          activeColor: '{primary.600}',
        },
        highlight: {
          background: '{primary.100}',
          focusBackground: '{primary.200}',
          color: '{primary.900}',
          focusColor: '{primary.950}',
        },
        text: textTokens,
        formField: { color: '{surface.800}', borderColor: '{surface.300}' },
      },
    },
  },
  components: {
    // Chosen toggles (roles, units) fill with amber so "on" reads at a glance, not just a lighter chip.
    togglebutton: {
      colorScheme: {
        light: {
          root: { color: '{surface.600}', checkedColor: '{surface.950}', hoverColor: '{surface.900}' },
          content: { checkedBackground: '{primary.400}' },
          icon: { checkedColor: '{surface.950}' },
        },
      },
    },
    // Aura writes message text in the 600 tones, a little under 4.5:1 on their own tints (red 600 on
    // red 50 is about 4.4:1 once laid over the page); one step darker reads at 5:1 and more.
    message: {
      colorScheme: {
        light: {
          info: { color: '{blue.700}', outlined: { color: '{blue.700}' }, simple: { color: '{blue.700}' } },
          success: { color: '{green.700}', outlined: { color: '{green.700}' }, simple: { color: '{green.700}' } },
          warn: { color: '{yellow.800}', outlined: { color: '{yellow.800}' }, simple: { color: '{yellow.800}' } },
          error: { color: '{red.700}', outlined: { color: '{red.700}' }, simple: { color: '{red.700}' } },
          secondary: { color: '{surface.700}', outlined: { color: '{surface.700}' }, simple: { color: '{surface.700}' } },
        },
      },
    },
    // Buttons: Aura's 500 fills carry white text at 2.3–3.8:1 and its text and outlined buttons use the
    // 500 tones as text; every severity here is 700 (fills) or 700–800 (text) so labels reach 4.5:1
    // on white and on the page (axe color-contrast in the browser journeys found each of these).
    button: {
      colorScheme: {
        light: {
          root: {
            success: filled('green'),
            info: filled('sky'),
            warn: filled('orange'),
            help: filled('purple'),
            danger: filled('red'),
          },
          text: {
            primary: { color: '{primary.800}' },
            secondary: { color: '{surface.600}' },
            success: { color: '{green.800}' },
            info: { color: '{sky.800}' },
            warn: { color: '{orange.800}' },
            help: { color: '{purple.700}' },
            danger: { color: '{red.700}' },
          },
          outlined: {
            primary: { color: '{primary.800}', borderColor: '{primary.400}' },
            secondary: { color: '{surface.600}' },
            success: { color: '{green.800}' },
            info: { color: '{sky.800}' },
            warn: { color: '{orange.800}' },
            help: { color: '{purple.700}' },
            danger: { color: '{red.700}' },
          },
          link: { color: '{primary.800}', hoverColor: '{primary.900}', activeColor: '{primary.950}' },
        },
      },
    },
    toast: {
      colorScheme: {
        light: {
          info: { color: '{blue.800}', detailColor: '{surface.700}' },
          success: { color: '{green.800}', detailColor: '{surface.700}' },
          warn: { color: '{yellow.800}', detailColor: '{surface.700}' },
          error: { color: '{red.800}', detailColor: '{surface.700}' },
          secondary: { color: '{surface.700}', detailColor: '{surface.700}' },
        },
      },
    },
  },
});
