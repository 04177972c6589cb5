/**
 * What a person chooses for this device: speed unit, theme and whether the alarm sounds.
 * Remembered in localStorage (per device, not per account: a shared site-office tablet and a
 * rigger's phone want different things).
 */
import { createStore } from './store.ts';
import { speedUnits, type SpeedUnit } from './units.ts';

export type Theme = 'system' | 'light' | 'dark';

export interface Prefs {
  unit: SpeedUnit;
  theme: Theme;
  /** The person asked for sound on alerts (the browser still needs a tap to allow it). */
  alarmSound: boolean;
  vibrate: boolean;
}

const key = 'holdfast.prefs';

function load(): Prefs {
  const fallback: Prefs = { unit: 'm/s', theme: 'system', alarmSound: false, vibrate: true };
  try {
    const raw = JSON.parse(localStorage.getItem(key) ?? '{}') as Partial<Prefs>;
    return {
      unit: speedUnits.includes(raw.unit as SpeedUnit) ? (raw.unit as SpeedUnit) : fallback.unit,
      theme: raw.theme === 'light' || raw.theme === 'dark' || raw.theme === 'system' ? raw.theme : fallback.theme,
      alarmSound: raw.alarmSound === true,
      vibrate: raw.vibrate !== false,
    };
  } catch {
    // Private browsing or a corrupt entry: start from the defaults rather than fail.
    return fallback;
  }
}

export const prefs = createStore<Prefs>(load());

prefs.subscribe((p) => {
  try {
    localStorage.setItem(key, JSON.stringify(p));
  } catch {
    // Storage full or refused: the choice lasts for this visit only.
  }
  applyTheme(p.theme);
});

export function setPref<K extends keyof Prefs>(name: K, value: Prefs[K]): void {
  prefs.update((p) => ({ ...p, [name]: value }));
}

/**
 * Sets data-theme on <html> to the theme in force, "system" resolved through prefers-color-scheme
 * (main.tsx calls this again when the phone switches), so the stylesheet has one dark palette.
 */
export function applyTheme(theme: Theme): void {
  const dark = theme === 'dark' || (theme === 'system' && matchMedia('(prefers-color-scheme: dark)').matches);
  document.documentElement.setAttribute('data-theme', dark ? 'dark' : 'light');
  document.querySelector('meta[name="theme-color"]')?.setAttribute('content', dark ? '#0b0d10' : '#ffffff');
}
