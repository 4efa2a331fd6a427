import { Box, Heading, type BoxProps } from '@chakra-ui/react';
import type { ReactNode } from 'react';

/** A bedside job on the pad: a labelled region, so a screen reader can jump between them. */
export function PadGroup({
  title,
  id,
  accent = 'ink.700',
  children,
  ...rest
}: { title: string; id: string; accent?: string; children: ReactNode } & Omit<BoxProps, 'title'>) {
  return (
    <Box
      as="section"
      aria-labelledby={`${id}-title`}
      data-testid={`group-${id}`}
      bg="white"
      borderRadius="l3"
      borderTopWidth="5px"
      borderTopColor={accent}
      boxShadow="xs"
      p="2"
      minW="0"
      {...rest}
    >
      <Heading
        as="h2"
        id={`${id}-title`}
        textStyle="xs"
        fontWeight="black"
        textTransform="uppercase"
        letterSpacing="wider"
        color="ink.700"
        mb="1.5"
      >
        {title}
      </Heading>
      {children}
    </Box>
  );
}
