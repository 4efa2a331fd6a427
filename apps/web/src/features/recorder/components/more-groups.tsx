import { SimpleGrid, Stack } from '@chakra-ui/react';
import { EditorPanel } from './editor-panel';
import { END_OUTCOME_CHOICES } from '@steadyhand/shared';
import { useState, memo } from 'react';
import { AIRWAY_WORDS, OUTCOME_WORDS } from '../../../lib/live/entry-words';
import { PadButton } from './pad-button';
import { PadSwitch } from './pad-switch';
import { PadGroup } from './pad-group';
import type { Tap } from './types';

/** Short words for narrow buttons; the full words are their accessible names. */
const AIRWAY_SHORT = { 'bag-mask': 'Bag-mask', supraglottic: 'Supraglottic', endotracheal: 'ET tube' } as const;

export const AirwayGroup = memo(function AirwayGroup({ onTap, disabled }: { onTap: Tap; disabled: boolean }) {
  const [capno, setCapno] = useState(false);
  return (
    <PadGroup title="Airway" id="airway" accent="ink.400">
      <SimpleGrid columns={2} gap="1.5">
        {(['bag-mask', 'supraglottic', 'endotracheal'] as const).map((device) => (
          <PadButton
            key={device}
            label={AIRWAY_SHORT[device]}
            labelSize="sm"
            aria-label={`Airway: ${AIRWAY_WORDS[device]}${device === 'endotracheal' && capno ? ', confirmed by waveform capnography' : ''}`}
            detail={device === 'endotracheal' && capno ? '+ capnography' : undefined}
            height="compact"
            disabled={disabled}
            data-testid={`airway-${device}`}
            onClick={() => {
              onTap(
                device === 'endotracheal' && capno
                  ? { kind: 'airway', device, confirmation: 'waveform-capnography' }
                  : { kind: 'airway', device },
              );
              setCapno(false);
            }}
          />
        ))}
        <PadSwitch
          on={capno}
          onToggle={setCapno}
          label="Tube confirmed by waveform capnography"
          onText="Capno: YES"
          offText="Capno?"
          disabled={disabled}
          data-testid="airway-capno"
        />
      </SimpleGrid>
    </PadGroup>
  );
});

export const AccessGroup = memo(function AccessGroup({ onTap, disabled }: { onTap: Tap; disabled: boolean }) {
  return (
    <PadGroup title="Access" id="access" accent="ink.400">
      <SimpleGrid columns={1} gap="1.5">
        <PadButton
          label="IV access"
          height="compact"
          disabled={disabled}
          data-testid="access-iv"
          onClick={() => onTap({ kind: 'access', route: 'iv' })}
        />
        <PadButton
          label="IO access"
          height="compact"
          disabled={disabled}
          data-testid="access-io"
          onClick={() => onTap({ kind: 'access', route: 'io' })}
        />
      </SimpleGrid>
    </PadGroup>
  );
});

export const Etco2Group = memo(function Etco2Group({
  onTap,
  onOther,
  disabled,
}: {
  onTap: Tap;
  onOther: () => void;
  disabled: boolean;
}) {
  return (
    <PadGroup title="ETCO2 (mmHg)" id="etco2" accent="ink.400" aria-describedby="etco2-caution">
      <SimpleGrid columns={3} gap="1.5">
        {[10, 20, 30, 40].map((v) => (
          <PadButton
            key={v}
            label={String(v)}
            height="compact"
            disabled={disabled}
            data-testid={`etco2-${v}`}
            aria-label={`ETCO2 ${v} mmHg`}
            onClick={() => onTap({ kind: 'etco2', mmHg: v })}
          />
        ))}
        <PadButton
          label="Other"
          height="compact"
          gridColumn="span 2"
          disabled={disabled}
          data-testid="etco2-other"
          aria-label="ETCO2, other value"
          onClick={onOther}
        />
      </SimpleGrid>
    </PadGroup>
  );
});

export const EventGroup = memo(function EventGroup({
  onTap,
  onNote,
  disabled,
}: {
  onTap: Tap;
  onNote: () => void;
  disabled: boolean;
}) {
  const [ending, setEnding] = useState(false);
  return (
    <PadGroup title="Events" id="events" accent="seaglass.700">
      <SimpleGrid columns={2} gap="1.5">
        <PadButton
          label="ROSC"
          height="compact"
          colorPalette="brand"
          disabled={disabled}
          data-testid="event-rosc"
          aria-label="ROSC"
          onClick={() => onTap({ kind: 'rosc' })}
        />
        <PadButton
          label="Re-arrest"
          height="compact"
          disabled={disabled}
          data-testid="event-rearrest"
          onClick={() => onTap({ kind: 'rearrest' })}
        />
        <PadButton
          label="Note"
          height="compact"
          disabled={disabled}
          data-testid="event-note"
          aria-label="Note: quick notes or text"
          onClick={onNote}
        />
        <PadButton
          label="End code…"
          height="compact"
          disabled={disabled}
          data-testid="event-end"
          aria-label="End code, then choose the outcome"
          aria-expanded={ending}
          onClick={() => setEnding(true)}
        />
      </SimpleGrid>
      {ending ? (
        // A panel over the pad, so choosing the outcome never pushes the buttons around.
        <EditorPanel title="End the code: outcome?" onCancel={() => setEnding(false)} testId="end-outcome">
          <Stack gap="2" role="group" aria-label="Outcome">
            {END_OUTCOME_CHOICES.map((o) => (
              <PadButton
                key={o}
                label={OUTCOME_WORDS[o]}
                colorPalette="ink"
                emphasis
                disabled={disabled}
                data-testid={`end-${o}`}
                aria-label={`End the code: ${OUTCOME_WORDS[o]}`}
                onClick={() => {
                  onTap({ kind: 'end', outcome: o });
                  setEnding(false);
                }}
              />
            ))}
            <PadButton
              label="Keep going"
              data-testid="end-cancel"
              aria-label="Do not end the code"
              onClick={() => setEnding(false)}
            />
          </Stack>
        </EditorPanel>
      ) : null}
    </PadGroup>
  );
});
