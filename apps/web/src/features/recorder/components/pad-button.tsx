import { Box, Button, Text, type ButtonProps } from '@chakra-ui/react';
import type { ReactNode } from 'react';

export interface PadButtonProps extends Omit<ButtonProps, 'children'> {
  /** The main word, read first. */
  label: ReactNode;
  /** A second line: the dose, the energy, what the tap will record. */
  detail?: ReactNode;
  /** The protocol's suggestion or the next expected tap: drawn heavier, with a marker. */
  emphasis?: boolean;
  /** A smaller label for long words in narrow cells. */
  labelSize?: 'sm' | 'md' | 'lg';
  /** 56 px (default) or 48 px (the WCAG 2.2 target size we never go under) for dense grids. */
  height?: 'tall' | 'compact';
}

/**
 * The pad's one button: at least 48 px high, bold, full width of its cell, and a press state
 * that shows under a gloved thumb. Emphasis uses weight and a border as well as colour.
 */
export function PadButton({
  label,
  detail,
  emphasis = false,
  height = 'tall',
  labelSize,
  variant,
  colorPalette = 'ink',
  'aria-label': context,
  ...rest
}: PadButtonProps) {
  // The visible words are the button's name (WCAG 2.5.3, label in name); what the caller says
  // beyond them is read as its description.
  return (
    <Button
      colorPalette={colorPalette}
      variant={variant ?? (emphasis ? 'solid' : 'outline')}
      minH={height === 'tall' ? '14' : '12'}
      minW="12"
      h="auto"
      w="full"
      px="2"
      py="1.5"
      whiteSpace="normal"
      flexDirection="column"
      alignItems="center"
      justifyContent="center"
      gap="0.5"
      borderWidth={emphasis ? '3px' : '2px'}
      borderColor={emphasis ? 'ink.950' : undefined}
      borderRadius="l3"
      bg={variant === undefined && !emphasis ? 'white' : undefined}
      _active={{ transform: 'scale(0.97)' }}
      transition="transform 80ms"
      _focusVisible={{ outline: '3px solid', outlineColor: 'ink.950', outlineOffset: '2px' }}
      data-pad-action=""
      aria-description={context}
      {...rest}
    >
      <Text
        as="span"
        textStyle={labelSize ?? (height === 'tall' ? 'lg' : 'md')}
        fontWeight="bold"
        lineHeight="1.15"
        textAlign="center"
      >
        {label}
      </Text>
      {detail ? ' ' : null}
      {detail ? (
        <Box
          as="span"
          textStyle="xs"
          fontWeight="bold"
          lineHeight="1.2"
          opacity={0.9}
          textAlign="center"
        >
          {detail}
        </Box>
      ) : null}
    </Button>
  );
}
