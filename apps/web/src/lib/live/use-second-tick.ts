import { useEffect, useState } from 'react';

/**
 * The corrected clock, read four times a second and re-rendered once a second. Timers are
 * computed from this reading, never by counting ticks, so a throttled tab catches up at once.
 */
export function useSecondTick(correctedNow: () => number): number {
  const [second, setSecond] = useState(() => Math.floor(correctedNow() / 1000));
  useEffect(() => {
    const read = () => setSecond(Math.floor(correctedNow() / 1000));
    read();
    const timer = window.setInterval(read, 250);
    document.addEventListener('visibilitychange', read);
    return () => {
      window.clearInterval(timer);
      document.removeEventListener('visibilitychange', read);
    };
  }, [correctedNow]);
  return second * 1000;
}
