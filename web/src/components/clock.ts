/** A re-render every `periodMs` (default 1 s) for ages that count up ("12 s ago"). */
import { useEffect, useState } from 'preact/hooks';

export function useNow(periodMs = 1_000): number {
  const [now, setNow] = useState(Date.now());
  useEffect(() => {
    const timer = setInterval(() => setNow(Date.now()), periodMs);
    return () => clearInterval(timer);
  }, [periodMs]);
  return now;
}
