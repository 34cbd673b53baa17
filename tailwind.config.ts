/**
 * Fringewalk's theme. Components use only the semantic colour names below (bg, surface, fg, accent,
 * danger…); each name is a CSS variable whose value comes from `lightTheme` or `hallTheme`.
 * "Hall" is the dark mode for dim vaults and basements: low glare, no pure white.
 *
 * The raw palette (deep teal, copper, basalt neutrals) is our own. Every text/background pair a
 * component uses is checked against WCAG 2.x AA in tests/client/theme-contrast.test.ts.
 */
import type { Config } from 'tailwindcss';
import plugin from 'tailwindcss/plugin';

export const palette = {
  teal: {
    50: '#eef8f6',
    100: '#d6efeb',
    200: '#a9dcd5',
    300: '#78c4bb',
    400: '#4aa9a0',
    500: '#2a8c84',
    600: '#1c716b',
    700: '#145955',
    800: '#0e4542',
    900: '#0a302e',
    950: '#061e1d',
  },
  copper: {
    100: '#f8e7d8',
    200: '#f0cba9',
    300: '#e6aa78',
    400: '#d98b52',
    500: '#c06d34',
    600: '#a15726',
    700: '#80431d',
    800: '#603216',
    900: '#3f2010',
  },
  basalt: {
    50: '#f5f2ec',
    100: '#e9e4db',
    200: '#d2cbc0',
    400: '#8b938f',
    500: '#66706c',
    600: '#4a5451',
    700: '#2f3a38',
    800: '#1c2625',
    850: '#152020',
    900: '#101918',
    950: '#0a1110',
  },
  signal: {
    red700: '#a3261b',
    red100: '#fbe7e4',
    red300: '#ff9e91',
    red950: '#3a1411',
    amber800: '#7a4a00',
    amber100: '#fcefd6',
    amber300: '#f3c56f',
    amber950: '#302208',
    green800: '#1d6638',
    green100: '#e2f3e7',
    green300: '#93d9aa',
    green950: '#0d2a19',
  },
} as const;

/** Semantic colour names → values, per theme. Keys become `--fw-<key>` and Tailwind colours. */
export const lightTheme = {
  bg: palette.basalt[50],
  surface: '#ffffff',
  'surface-sunken': palette.basalt[100],
  border: palette.basalt[200],
  'field-border': palette.basalt[500],
  fg: palette.basalt[900],
  'fg-muted': palette.basalt[600],
  accent: palette.teal[700],
  'accent-hover': palette.teal[800],
  'accent-fg': '#ffffff',
  'accent-soft': palette.teal[50],
  'accent-soft-fg': palette.teal[800],
  link: palette.teal[700],
  ring: palette.copper[600],
  brand: palette.copper[700],
  header: palette.teal[900],
  'header-fg': palette.teal[50],
  'header-muted': palette.teal[200],
  'header-ring': palette.copper[300],
  danger: palette.signal.red700,
  'danger-soft': palette.signal.red100,
  warning: palette.signal.amber800,
  'warning-soft': palette.signal.amber100,
  ok: palette.signal.green800,
  'ok-soft': palette.signal.green100,
  offline: palette.copper[800],
  'offline-soft': palette.copper[100],
} as const;

export type ThemeTokens = Record<keyof typeof lightTheme, string>;

export const hallTheme: ThemeTokens = {
  bg: palette.basalt[950],
  surface: palette.basalt[850],
  'surface-sunken': palette.basalt[900],
  border: palette.basalt[700],
  'field-border': palette.basalt[400],
  fg: '#e3ebe7',
  'fg-muted': '#a7b6b1',
  accent: palette.teal[300],
  'accent-hover': palette.teal[200],
  'accent-fg': palette.teal[950],
  'accent-soft': palette.teal[900],
  'accent-soft-fg': palette.teal[100],
  link: palette.teal[300],
  ring: palette.copper[300],
  brand: palette.copper[300],
  header: palette.teal[900],
  'header-fg': palette.teal[50],
  'header-muted': palette.teal[300],
  'header-ring': palette.copper[300],
  danger: palette.signal.red300,
  'danger-soft': palette.signal.red950,
  warning: palette.signal.amber300,
  'warning-soft': palette.signal.amber950,
  ok: palette.signal.green300,
  'ok-soft': palette.signal.green950,
  offline: palette.copper[200],
  'offline-soft': palette.copper[900],
};

/** Minimum touch target for gloved hands: 48 px (WCAG 2.5.5 asks 44; we take the larger platform guidance). */
export const TOUCH_TARGET_PX = 48;

function cssVariables(theme: ThemeTokens): Record<string, string> {
  return Object.fromEntries(Object.entries(theme).map(([name, value]) => [`--fw-${name}`, value]));
}

const tokenNames = Object.keys(lightTheme) as Array<keyof typeof lightTheme>;

export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: Object.fromEntries(tokenNames.map((name) => [name, `var(--fw-${name})`])),
      fontFamily: {
        sans: ['"Atkinson Hyperlegible"', 'system-ui', 'sans-serif'],
      },
      spacing: { touch: `${TOUCH_TARGET_PX / 16}rem` },
      minHeight: { touch: `${TOUCH_TARGET_PX / 16}rem` },
      minWidth: { touch: `${TOUCH_TARGET_PX / 16}rem` },
    },
  },
  plugins: [
    plugin(({ addBase }) => {
      addBase({
        ':root': { ...cssVariables(lightTheme), 'color-scheme': 'light' },
        // With no remembered choice, follow the system preference.
        '@media (prefers-color-scheme: dark)': {
          ':root:not([data-theme="light"])': { ...cssVariables(hallTheme), 'color-scheme': 'dark' },
        },
        ':root[data-theme="hall"]': { ...cssVariables(hallTheme), 'color-scheme': 'dark' },
      });
    }),
  ],
} satisfies Config;
