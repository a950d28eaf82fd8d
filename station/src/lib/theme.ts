import { useCallback, useLayoutEffect, useState, useSyncExternalStore } from 'react';

export type Theme = 'light' | 'dark';

const STORAGE_KEY = 'tareline.theme';
const DARK_QUERY = '(prefers-color-scheme: dark)';

/** The theme the operator chose on this screen, or null when they never chose one. */
export function storedTheme(): Theme | null {
  const value = localStorage.getItem(STORAGE_KEY);
  return value === 'light' || value === 'dark' ? value : null;
}

/**
 * Puts the theme on <html> for index.css to pick up; null hands the choice back to the device's
 * own light/dark preference.
 */
export function applyTheme(theme: Theme | null) {
  if (theme) document.documentElement.dataset.theme = theme;
  else delete document.documentElement.dataset.theme;
}

function subscribeToDevice(onChange: () => void) {
  // Some browsers (and jsdom) have no matchMedia: the device preference is then light.
  const query = window.matchMedia?.(DARK_QUERY);
  query?.addEventListener('change', onChange);
  return () => query?.removeEventListener('change', onChange);
}

function deviceTheme(): Theme {
  return window.matchMedia?.(DARK_QUERY).matches ? 'dark' : 'light';
}

/**
 * The bench theme in force and a setter that remembers the choice on this screen. Until someone
 * chooses, the device's preference applies (and follows it when it changes).
 */
export function useTheme(): [Theme, (theme: Theme) => void] {
  const [chosen, setChosen] = useState<Theme | null>(storedTheme);
  const device = useSyncExternalStore(subscribeToDevice, deviceTheme, () => 'light' as const);

  // Before paint, so a dark bench screen never flashes light on start.
  useLayoutEffect(() => applyTheme(chosen), [chosen]);

  const choose = useCallback((theme: Theme) => {
    localStorage.setItem(STORAGE_KEY, theme);
    setChosen(theme);
  }, []);
  return [chosen ?? device, choose];
}
