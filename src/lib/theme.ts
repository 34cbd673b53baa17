/**
 * Light mode or "hall" mode (dark, for dim vaults). The choice is remembered on the device; with no
 * choice the system preference decides. Applied as data-theme on <html>, which the CSS variables
 * from tailwind.config.ts key on.
 */
import { useCallback, useSyncExternalStore } from 'react';

export type ThemeName = 'light' | 'hall';
export const THEME_STORAGE_KEY = 'fringewalk.theme';
const DARK_QUERY = '(prefers-color-scheme: dark)';

function storedTheme(): ThemeName | null {
  try {
    const value = window.localStorage.getItem(THEME_STORAGE_KEY);
    return value === 'light' || value === 'hall' ? value : null;
  } catch {
    return null;
  }
}

function systemTheme(): ThemeName {
  return typeof window.matchMedia === 'function' && window.matchMedia(DARK_QUERY).matches ? 'hall' : 'light';
}

export function resolvedTheme(): ThemeName {
  return storedTheme() ?? systemTheme();
}

/** Write the theme onto <html>; call once before the first render to avoid a flash. */
export function applyTheme(theme: ThemeName | null = storedTheme()) {
  const root = document.documentElement;
  if (theme) root.dataset.theme = theme;
  else delete root.dataset.theme;
  // The browser's own bar takes the header colour of whichever theme the CSS resolved to.
  const header = getComputedStyle(root).getPropertyValue('--fw-header').trim();
  if (header) document.querySelector('meta[name="theme-color"]')?.setAttribute('content', header);
}

const listeners = new Set<() => void>();
function notify() {
  for (const listener of listeners) listener();
}

function subscribe(listener: () => void) {
  listeners.add(listener);
  const media = typeof window.matchMedia === 'function' ? window.matchMedia(DARK_QUERY) : null;
  const onSystemChange = () => {
    applyTheme();
    listener();
  };
  media?.addEventListener('change', onSystemChange);
  return () => {
    listeners.delete(listener);
    media?.removeEventListener('change', onSystemChange);
  };
}

export function setTheme(theme: ThemeName) {
  try {
    window.localStorage.setItem(THEME_STORAGE_KEY, theme);
  } catch {
    // Storage full or blocked: the theme still applies for this visit.
  }
  applyTheme(theme);
  notify();
}

export function useTheme() {
  const theme = useSyncExternalStore(subscribe, resolvedTheme, () => 'light' as ThemeName);
  const toggle = useCallback(() => setTheme(theme === 'hall' ? 'light' : 'hall'), [theme]);
  return { theme, setTheme, toggle };
}
