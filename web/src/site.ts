/**
 * The site's settings (name, time zone, default levels...), loaded once after sign-in and again
 * after the competent person changes them. Times everywhere are shown in the site's time zone,
 * not the phone's: a log read from another country must match the site's own clock.
 */
import { api } from './api.ts';
import { live } from './live.ts';
import { createStore, useStore } from './store.ts';
import type { SiteView } from './types.ts';

export const site = createStore<SiteView | null>(null);
export const siteDensity = createStore<number | null>(null);
/** The design density the levels are checked at on save (and the register form calculates at). */
export const siteDesignDensity = createStore<number | null>(null);

export async function loadSite(): Promise<void> {
  try {
    const answer = await api<{ site: SiteView; airDensityKgM3: number; designAirDensityKgM3: number }>('/api/site');
    site.set(answer.site);
    siteDensity.set(answer.airDensityKgM3);
    siteDesignDensity.set(answer.designAirDensityKgM3);
  } catch {
    // Screens fall back to the live snapshot's site block, and to UTC for times.
  }
}

/** The site's time zone from the settings or the live snapshot; UTC until either has arrived. */
export function useTimeZone(): string {
  const s = useStore(site);
  const l = useStore(live);
  return s?.timeZone ?? l.snapshot?.site.timeZone ?? 'UTC';
}
