import { SimpleGrid, Stack } from '@chakra-ui/react';
import { RHYTHMS, SHOCKABLE_RHYTHMS } from '@steadyhand/shared';
import { useState, memo } from 'react';
import { RHYTHM_WORDS } from '../../../lib/live/entry-words';
import { PadButton } from './pad-button';
import { PadSwitch } from './pad-switch';
import { PadGroup } from './pad-group';
import type { Tap } from './types';

/** Set the pulse first if there is one (it starts at "no pulse"), then tap what the monitor shows. */
export const RhythmGroup = memo(function RhythmGroup({ onTap, disabled }: { onTap: Tap; disabled: boolean }) {
  const [pulse, setPulse] = useState(false);
  return (
    <PadGroup title="Rhythm check" id="rhythm" accent="ink.500">
      <Stack gap="1.5">
        <PadSwitch
          on={pulse}
          onToggle={setPulse}
          label="Pulse present"
          onText="Pulse: YES"
          offText="Pulse: no"
          disabled={disabled}
          data-testid="rhythm-pulse"
        />
        <SimpleGrid columns={3} gap="1.5">
          {RHYTHMS.map((r) => {
            const shockable = SHOCKABLE_RHYTHMS.includes(r);
            return (
              <PadButton
                key={r}
                label={RHYTHM_WORDS[r]}
                detail={shockable ? 'shockable' : undefined}
                height="compact"
                labelSize="sm"
                disabled={disabled}
                data-testid={`rhythm-${r}`}
                aria-label={`Rhythm ${RHYTHM_WORDS[r]}, ${pulse ? 'pulse present' : 'no pulse'}`}
                onClick={() => {
                  onTap({ kind: 'rhythm', rhythm: r, pulse });
                  setPulse(false); // each check starts again from "no pulse"
                }}
              />
            );
          })}
        </SimpleGrid>
      </Stack>
    </PadGroup>
  );
});
