/**
 * Every text/background pair the components use, in both themes, meets WCAG 2.x AA: 4.5:1 for
 * text, 3:1 for non-text UI (input borders, focus rings). Ratios computed by the `color` npm
 * package's contrast() (WCAG 2.x relative-luminance formula), not by our own code.
 */
import Color from 'color';
import { describe, expect, it } from 'vitest';
import { hallTheme, lightTheme, TOUCH_TARGET_PX, type ThemeTokens } from '../../tailwind.config';

type Token = keyof ThemeTokens;

const TEXT_PAIRS: Array<[Token, Token]> = [
  ['fg', 'bg'],
  ['fg', 'surface'],
  ['fg', 'surface-sunken'],
  ['fg-muted', 'bg'],
  ['fg-muted', 'surface'],
  ['fg-muted', 'surface-sunken'],
  ['link', 'bg'],
  ['link', 'surface'],
  ['link', 'surface-sunken'],
  ['accent-fg', 'accent'],
  ['accent-fg', 'accent-hover'],
  ['accent-soft-fg', 'accent-soft'],
  ['fg', 'accent-soft'],
  ['header-fg', 'header'],
  ['header-muted', 'header'],
  ['danger', 'danger-soft'],
  ['danger', 'surface'],
  ['fg', 'danger-soft'],
  ['warning', 'warning-soft'],
  ['fg', 'warning-soft'],
  ['ok', 'ok-soft'],
  ['fg', 'ok-soft'],
  ['offline', 'offline-soft'],
  ['fg', 'offline-soft'],
];

const UI_PAIRS: Array<[Token, Token]> = [
  ['field-border', 'surface'],
  ['danger', 'surface'],
  ['ring', 'bg'],
  ['ring', 'surface'],
  ['header-ring', 'header'],
  ['accent', 'surface'],
];

const contrast = (theme: ThemeTokens, fg: Token, bg: Token) => Color(theme[fg]).contrast(Color(theme[bg]));

describe.each([
  ['light', lightTheme as ThemeTokens],
  ['hall', hallTheme],
])('the %s theme', (_name, theme) => {
  it.each(TEXT_PAIRS)('text %s on %s reaches 4.5:1', (fg, bg) => {
    expect(contrast(theme, fg, bg)).toBeGreaterThanOrEqual(4.5);
  });
  it.each(UI_PAIRS)('non-text %s on %s reaches 3:1', (fg, bg) => {
    expect(contrast(theme, fg, bg)).toBeGreaterThanOrEqual(3);
  });
});

describe('the contrast reference', () => {
  it('gives 21:1 for black on white, the WCAG 2.x maximum', () => {
    expect(Color('#000').contrast(Color('#fff'))).toBeCloseTo(21, 5);
  });
});

describe('touch targets', () => {
  it('are at least 48 px, above the 44 px of WCAG 2.5.5 (gloved hands)', () => {
    expect(TOUCH_TARGET_PX).toBeGreaterThanOrEqual(48);
  });
});
