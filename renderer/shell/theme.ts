/** Light and dark themes: the choice is remembered on this machine; the system's preference is the default. */
const key = 'rampwright.theme';

export type Theme = 'light' | 'dark';

export function initialTheme(): Theme {
  const saved = safeStorage()?.getItem(key);
  if (saved === 'light' || saved === 'dark') return saved;
  return window.matchMedia?.('(prefers-color-scheme: dark)').matches ? 'dark' : 'light';
}

export function applyTheme(theme: Theme): void {
  document.documentElement.dataset.theme = theme;
  safeStorage()?.setItem(key, theme);
}

export function currentTheme(): Theme {
  return document.documentElement.dataset.theme === 'dark' ? 'dark' : 'light';
}

function safeStorage(): Storage | null {
  try {
    return window.localStorage;
  } catch {
    return null; // storage can be off (private windows, file URLs); the theme then lasts one visit
  }
}
