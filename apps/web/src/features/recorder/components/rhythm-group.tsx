import { Button, SimpleGrid, Stack } from '@chakra-ui/react';
import { RHYTHMS, SHOCKABLE_RHYTHMS } from '@steadyhand/shared';
import { useState } from 'react';
import { RHYTHM_WORDS } from '../../../lib/live/entry-words';
import { PadButton } from './pad-button';
import { PadGroup } from './pad-group';
import { Shape } from '../../../components/ui/shapes';
import type { Tap } from './types';

/** Set the pulse first if there is one (it starts at "no pulse"), then tap what the monitor shows. */
export function RhythmGroup({ onTap, disabled }: { onTap: Tap; disabled: boolean }) {
  const [pulse, setPulse] = useState(false);
  return (
    <PadGroup title="Rhythm check" id="rhythm" accent="ink.500">
      <Stack gap="2">
        <Button
          role="switch"
          aria-checked={pulse}
          aria-label="Pulse present"
          data-testid="rhythm-pulse"
          minH="16"
          h="auto"
          w="full"
          variant={pulse ? 'solid' : 'outline'}
          colorPalette={pulse ? 'brand' : 'ink'}
          bg={pulse ? undefined : 'white'}
          borderWidth="2px"
          borderStyle={pulse ? 'solid' : 'dashed'}
          textStyle="lg"
          disabled={disabled}
          onClick={() => setPulse((p) => !p)}
        >
          <Shape kind={pulse ? 'check' : 'ring'} size="1.4em" />
          {pulse ? 'Pulse: YES' : 'Pulse: no'}
        </Button>
        <SimpleGrid columns={2} gap="2">
          {RHYTHMS.map((r) => {
            const shockable = SHOCKABLE_RHYTHMS.includes(r);
            return (
              <PadButton
                key={r}
                label={RHYTHM_WORDS[r]}
                detail={shockable ? 'shockable' : undefined}
                height="compact"
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
}
