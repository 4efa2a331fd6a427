import { Box, Button, Flex, SimpleGrid, Text } from '@chakra-ui/react';

const KEYS = ['1', '2', '3', '4', '5', '6', '7', '8', '9', '.', '0', 'back'] as const;

/** Digits without a typing keyboard: large keys, one decimal point, a delete key. */
export function NumberPad({
  value,
  onChange,
  unit,
  label,
  allowDecimal = true,
  maxLength = 6,
}: {
  value: string;
  onChange: (next: string) => void;
  unit: string;
  label: string;
  allowDecimal?: boolean;
  maxLength?: number;
}) {
  const press = (key: (typeof KEYS)[number]) => {
    if (key === 'back') return onChange(value.slice(0, -1));
    if (key === '.' && (!allowDecimal || value.includes('.'))) return;
    if (value.length >= maxLength) return;
    onChange(value === '0' && key !== '.' ? key : value === '' && key === '.' ? '0.' : value + key);
  };
  return (
    <Box>
      <Flex
        role="status"
        aria-live="polite"
        aria-label={`${label}: ${value === '' ? 'nothing entered' : `${value} ${unit}`}`}
        align="baseline"
        justify="flex-end"
        gap="2"
        bg="ink.50"
        borderRadius="l2"
        px="4"
        py="2"
        mb="2"
        minH="16"
      >
        <Text textStyle="4xl" fontWeight="bold" data-testid="numpad-value">
          {value === '' ? '–' : value}
        </Text>
        <Text textStyle="xl">{unit}</Text>
      </Flex>
      <SimpleGrid columns={3} gap="2">
        {KEYS.map((key) => (
          <Button
            key={key}
            variant="outline"
            colorPalette="ink"
            bg="white"
            minH="16"
            textStyle="2xl"
            disabled={key === '.' && !allowDecimal}
            aria-label={key === 'back' ? 'Delete last digit' : key === '.' ? 'Decimal point' : key}
            data-testid={`numpad-${key === '.' ? 'dot' : key}`}
            onClick={() => press(key)}
          >
            {key === 'back' ? '⌫' : key}
          </Button>
        ))}
      </SimpleGrid>
    </Box>
  );
}

export function parsePadNumber(value: string): number | null {
  if (value === '' || value === '.') return null;
  const n = Number(value);
  return Number.isFinite(n) ? n : null;
}
