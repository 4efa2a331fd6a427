import { HStack, Text } from '@chakra-ui/react';

export type TargetState = 'met' | 'missed' | 'not-applicable';

const LOOK: Record<TargetState, { mark: string; words: string; color: string }> = {
  met: { mark: '✓', words: 'Met', color: 'seaglass.700' },
  missed: { mark: '✕', words: 'Missed', color: 'alarm.700' },
  'not-applicable': { mark: '–', words: 'Does not apply', color: 'fg.muted' },
};

export const targetState = (met: boolean | null): TargetState => (met === null ? 'not-applicable' : met ? 'met' : 'missed');

/** Met / missed with a mark and words, never colour alone. */
export function TargetStatus({ state }: { state: TargetState }) {
  const look = LOOK[state];
  return (
    <HStack gap="1.5" color={look.color} fontWeight="bold" data-state={state}>
      <Text as="span" aria-hidden="true" fontSize="1.2em" lineHeight="1">
        {look.mark}
      </Text>
      <Text as="span">{look.words}</Text>
    </HStack>
  );
}
