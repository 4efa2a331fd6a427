import { Box, Stack, Text } from '@chakra-ui/react';
import {
  TAPS_NOT_SENSOR,
  type Code,
  type DosingSheet,
  type ProtocolSettings,
} from '@steadyhand/shared';
import type { LiveClock } from '../../../lib/live/use-live-code';
import { ArrestTime } from './arrest-time';
import { CodeDetails } from './code-details';
import { EditorPanel } from './editor-panel';

/** The dosing sheet's own cautions, folded away but one tap from every dose. */
function DosingCautions({ sheet }: { sheet: DosingSheet }) {
  const perDrug = sheet.drugs.flatMap((d) =>
    [...d.cautions, ...d.notes].map((text) => `${d.label}: ${text}`),
  );
  return (
    <Box as="details" data-testid="dosing-cautions">
      <Box
        as="summary"
        cursor="pointer"
        fontWeight="bold"
        textStyle="sm"
        minH="12"
        display="flex"
        alignItems="center"
      >
        Dosing cautions and notes ({sheet.cautions.length + perDrug.length})
      </Box>
      <Stack as="ul" gap="1" pl="4" textStyle="xs">
        {[...sheet.cautions, ...perDrug].map((c) => (
          <li key={c}>{c}</li>
        ))}
      </Stack>
    </Box>
  );
}

/**
 * What is set once or rarely (adult or child, weight, place, arrest time) and the fine print,
 * in a sheet opened from the pad's header, so the pad itself holds only the bedside jobs.
 * Loaded on first opening: the pad's own chunk stays small.
 */
export default function CodeDetailsSheet({
  code,
  canWrite,
  onSaved,
  onClose,
  clock,
  protocol,
  sheet,
}: {
  code: Code;
  canWrite: boolean;
  onSaved: (code: Code) => void;
  onClose: () => void;
  clock: LiveClock;
  protocol: ProtocolSettings;
  sheet: DosingSheet | null;
}) {
  return (
    <EditorPanel
      title="Code details"
      onCancel={onClose}
      testId="details-sheet"
      cancelLabel="Close"
      cancelTestId="details-close"
    >
      <Stack gap="3">
        <CodeDetails code={code} canWrite={canWrite} onSaved={onSaved} />
        <ArrestTime code={code} canWrite={canWrite} onSaved={onSaved} />
        <Text textStyle="sm" color="ink.700" data-testid="clock-offset">
          Clock offset {Math.round(clock.offsetMs)} ms
          {clock.uncertaintyMs !== null
            ? ` ± ${Math.round(clock.uncertaintyMs)} ms`
            : ' (not yet measured)'}
        </Text>
        <Text textStyle="xs" color="ink.700">
          Protocol version {code.protocolVersion ?? 1}: {protocol.edition}. Times shown are when
          each event happened, as tapped. {TAPS_NOT_SENSOR}
        </Text>
        {sheet?.status === 'ready' ? (
          <Text textStyle="sm" fontWeight="bold">
            Weight-based doses and energies: {sheet.edition}.
          </Text>
        ) : null}
        {sheet ? <DosingCautions sheet={sheet} /> : null}
      </Stack>
    </EditorPanel>
  );
}
