import { Text, type TextProps } from '@chakra-ui/react';
import { formatElapsedMs } from '@steadyhand/shared';
import { useEffect, useState } from 'react';

/** How often the arrest clock reads the corrected clock; it shows whole seconds. */
const READ_EVERY_MS = 40;

/**
 * The time since the arrest began, read from the corrected clock on every tick (never by
 * counting ticks). `data-elapsed-ms` carries the exact corrected elapsed time this render
 * displays, so two walls can be compared to the millisecond. Frozen at `frozenAtMs` once the
 * code has ended.
 */
export function ArrestClock({
  arrestAtMs,
  frozenAtMs,
  correctedNow,
  testId,
  ...rest
}: {
  arrestAtMs: number;
  frozenAtMs: number | null;
  correctedNow: () => number;
  testId?: string;
} & Omit<TextProps, 'children'>) {
  const read = () => (frozenAtMs ?? correctedNow()) - arrestAtMs;
  const [elapsedMs, setElapsedMs] = useState(read);
  useEffect(() => {
    const tick = () => setElapsedMs((frozenAtMs ?? correctedNow()) - arrestAtMs);
    tick();
    const timer = window.setInterval(tick, READ_EVERY_MS);
    document.addEventListener('visibilitychange', tick);
    return () => {
      window.clearInterval(timer);
      document.removeEventListener('visibilitychange', tick);
    };
  }, [arrestAtMs, frozenAtMs, correctedNow]);
  return (
    <Text
      as="span"
      fontVariantNumeric="tabular-nums"
      fontWeight="bold"
      lineHeight="0.95"
      data-testid={testId}
      data-elapsed-ms={Math.round(elapsedMs)}
      {...rest}
    >
      {formatElapsedMs(Math.max(0, elapsedMs))}
    </Text>
  );
}
