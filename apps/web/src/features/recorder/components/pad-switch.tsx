import { Button } from '@chakra-ui/react';
import { Shape, type ShapeKind } from '../../../components/ui/shapes';

interface PadSwitchProps {
  on: boolean;
  onToggle: (on: boolean) => void;
  /** What the switch sets, for screen readers ("Pulse present"). */
  label: string;
  onText: string;
  offText: string;
  /** The mark when on; off always shows a ring, and a dashed border says "not set". */
  onShape?: ShapeKind;
  /** `signal`: the shock group's amber, so synchronised mode cannot be mistaken for a plain toggle. */
  tone?: 'brand' | 'signal';
  disabled: boolean;
  'data-testid': string;
}

/** A pad toggle (pulse, capnography, synchronised): set before the tap it changes, in words and a mark. */
export function PadSwitch({
  on,
  onToggle,
  label,
  onText,
  offText,
  onShape = 'check',
  tone = 'brand',
  disabled,
  'data-testid': testId,
}: PadSwitchProps) {
  const look =
    tone === 'signal'
      ? {
          variant: 'solid' as const,
          bg: on ? 'signal.300' : 'ink.100',
          color: 'ink.950',
          borderWidth: '3px',
          borderColor: 'ink.900',
        }
      : {
          variant: on ? ('solid' as const) : ('outline' as const),
          colorPalette: on ? 'brand' : 'ink',
          bg: on ? undefined : 'white',
          borderWidth: '2px',
        };
  return (
    <Button
      role="switch"
      aria-checked={on}
      aria-description={label}
      data-testid={testId}
      minH="12"
      h="auto"
      data-pad-action=""
      _focusVisible={{ outline: '3px solid', outlineColor: 'ink.950', outlineOffset: '2px' }}
      w="full"
      whiteSpace="normal"
      borderStyle={on ? 'solid' : 'dashed'}
      textStyle="md"
      disabled={disabled}
      onClick={() => onToggle(!on)}
      {...look}
    >
      <Shape kind={on ? onShape : 'ring'} size="1.4em" />
      {on ? onText : offText}
    </Button>
  );
}
