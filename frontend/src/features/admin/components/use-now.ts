import { useEffect, useState } from 'react';

/** The current time, ticking every `intervalMs`, so relative times ("12 s ago") stay true between refetches. */
export function useNow(intervalMs = 5_000): number {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    const timer = setInterval(() => setNow(Date.now()), intervalMs);
    return () => clearInterval(timer);
  }, [intervalMs]);
  return now;
}
