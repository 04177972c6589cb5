/** Whether a CSS media query matches now; the component re-renders when that changes (a phone turned, a window resized). */
import { useEffect, useState } from 'preact/hooks';

export function useMedia(query: string): boolean {
  const [matches, setMatches] = useState(() => matchMedia(query).matches);
  useEffect(() => {
    const list = matchMedia(query);
    const changed = () => setMatches(list.matches);
    changed();
    list.addEventListener('change', changed);
    return () => list.removeEventListener('change', changed);
  }, [query]);
  return matches;
}
