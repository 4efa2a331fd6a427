import { Box, Heading, HStack, Stack, Text } from '@chakra-ui/react';
import type { TargetResult } from '@steadyhand/shared';
import { TargetStatus, targetState } from './target-status';
import { formatPercent, formatSeconds } from './words';

/** Each target met or missed, with the code's value, the rule and where the rule comes from. */
export function TargetList({ targets }: { targets: TargetResult[] }) {
  return (
    <Stack as="ul" gap="3" listStyleType="none" data-testid="quality-targets">
      {targets.map((t) => {
        const state = targetState(t.met);
        return (
          <Box
            as="li"
            key={t.id}
            data-testid={`quality-target-${t.id}`}
            data-state={state}
            borderWidth="1px"
            borderLeftWidth="6px"
            borderLeftColor={state === 'met' ? 'seaglass.600' : state === 'missed' ? 'alarm.600' : 'border'}
            borderRadius="l2"
            p="4"
            bg="bg.panel"
          >
            <HStack justify="space-between" wrap="wrap" gap="3">
              <Heading as="h3" textStyle="lg">
                {t.label}: {t.value === null ? 'not recorded' : t.unit === 'ratio' ? formatPercent(t.value) : `${formatSeconds(t.value)} (${Math.round(t.value)} s)`}
              </Heading>
              <TargetStatus state={state} />
            </HStack>
            <Text mt="2">{t.rule}</Text>
            {t.note ? <Text mt="1" fontStyle="italic">{t.note}</Text> : null}
            <Text mt="2" textStyle="sm" color="fg.muted">
              Source: {t.source}
            </Text>
          </Box>
        );
      })}
    </Stack>
  );
}
