/**
 * Hash routing (#/board, #/structure/3, ...): works behind any static file server and survives a
 * reload on a phone without the server knowing the screens.
 */
import { createStore, useStore } from './store.ts';

function current(): string {
  const h = location.hash.replace(/^#/, '');
  return h.startsWith('/') ? h : '/';
}

export const route = createStore(current());
window.addEventListener('hashchange', () => {
  route.set(current());
  window.scrollTo(0, 0);
});

export function navigate(path: string): void {
  if (current() === path) return;
  location.hash = path;
}

/** The current path split at "/" with the query removed: "#/register/3?x" → ["register", "3"]. */
export function useRoute(): { path: string; parts: string[]; query: URLSearchParams } {
  const path = useStore(route);
  const [p, q = ''] = path.split('?');
  return { path: p!, parts: p!.split('/').filter(Boolean), query: new URLSearchParams(q) };
}

export const href = (path: string): string => `#${path}`;
