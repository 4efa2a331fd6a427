import { Box, HStack, Stack, Text } from '@chakra-ui/react';
import { DISCREPANCY_WORDS, PROBLEM_KINDS, type Discrepancy } from '@steadyhand/shared';

// Shape + words + colour: a problem is a triangle, information a circle, balanced a tick.
const LOOK = {
  problem: { glyph: '▲', palette: 'red' },
  info: { glyph: '●', palette: 'orange' },
  ok: { glyph: '✓', palette: 'green' },
} as const;

function lookOf(d: Discrepancy) {
  if (PROBLEM_KINDS.includes(d.kind)) return LOOK.problem;
  return d.kind === 'balanced' ? LOOK.ok : LOOK.info;
}

/** Each discrepancy by shape, word and colour; `compact` leaves the explanation to the line under a table row. */
export function DiscrepancyList({ discrepancies, testId, compact }: { discrepancies: Discrepancy[]; testId?: string; compact?: boolean }) {
  return (
    <Stack gap="1" data-testid={testId}>
      {discrepancies.map((d) => {
        const look = lookOf(d);
        return (
          <Box key={d.kind} colorPalette={look.palette} bg="colorPalette.subtle" color="colorPalette.fg" borderLeftWidth="4px" borderColor="colorPalette.solid" px="2" py="1" borderRadius="l1">
            <HStack gap="2" align="baseline">
              <Text as="span" aria-hidden fontWeight="bold">
                {look.glyph}
              </Text>
              <Text as="span" fontWeight="bold" data-kind={d.kind}>
                {DISCREPANCY_WORDS[d.kind]}
              </Text>
            </HStack>
            {d.kind !== 'balanced' && !compact ? <Text textStyle="sm">{d.message}</Text> : null}
          </Box>
        );
      })}
    </Stack>
  );
}
