import { SimpleGrid, Stack, Text } from '@chakra-ui/react';
import { memo } from 'react';
import { PadButton } from './pad-button';
import { PadGroup } from './pad-group';
import type { Tap } from './types';

const PAUSES = [
  { reason: 'rhythm-check', label: 'Rhythm check' },
  { reason: 'shock', label: 'Shock' },
  { reason: 'airway', label: 'Airway' },
  { reason: 'other', label: 'Other' },
] as const;

/** Start, pause (with why), swap. The layout never moves; what is expected next is drawn heavier. */
export const CprGroup = memo(function CprGroup({
  running,
  onTap,
  disabled,
}: {
  running: boolean;
  onTap: Tap;
  disabled: boolean;
}) {
  return (
    <PadGroup title="Compressions" id="cpr" accent="seaglass.600">
      <Stack gap="1.5">
        <SimpleGrid columns={2} gap="1.5">
          <PadButton
            label="Start"
            detail={running ? 'running now' : 'not running'}
            emphasis={!running}
            colorPalette="brand"
            height="compact"
            disabled={disabled}
            data-testid="cpr-start"
            aria-label="Start compressions"
            onClick={() => onTap({ kind: 'cpr', action: 'start' })}
          />
          <PadButton
            label="Swap"
            detail="compressor"
            height="compact"
            disabled={disabled}
            data-testid="cpr-swap"
            aria-label="Swap compressor"
            onClick={() => onTap({ kind: 'cpr', action: 'swap' })}
          />
        </SimpleGrid>
        <Text textStyle="xs" fontWeight="bold" color="ink.700" id="cpr-pause-label" lineHeight="1">
          Pause for
        </Text>
        <SimpleGrid columns={2} gap="1.5" role="group" aria-labelledby="cpr-pause-label">
          {PAUSES.map((p) => (
            <PadButton
              key={p.reason}
              label={p.label}
              height="compact"
              emphasis={running && p.reason === 'rhythm-check'}
              disabled={disabled}
              data-testid={`cpr-pause-${p.reason}`}
              aria-label={`Pause compressions for ${p.label.toLowerCase()}`}
              onClick={() => onTap({ kind: 'cpr', action: 'stop', reason: p.reason })}
            />
          ))}
        </SimpleGrid>
      </Stack>
    </PadGroup>
  );
});
