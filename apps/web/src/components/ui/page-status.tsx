import { Box, Button, Heading, Spinner, Stack, Text } from '@chakra-ui/react';
import type { ReactNode } from 'react';

/** A whole-page wait, with words for screen readers and for anyone glancing at the tablet. */
export function PageSpinner({ label = 'Loading…' }: { label?: string }) {
  return (
    <Stack role="status" aria-live="polite" align="center" justify="center" minH="60dvh" gap="4">
      <Spinner size="xl" color="brand.solid" borderWidth="4px" />
      <Text textStyle="lg">{label}</Text>
    </Stack>
  );
}

interface PageProblemProps {
  title: string;
  children?: ReactNode;
  actionLabel?: string;
  onAction?: () => void;
}

/** A whole-page problem with one clear way out. */
export function PageProblem({ title, children, actionLabel, onAction }: PageProblemProps) {
  return (
    <Box maxW="40rem" mx="auto" py="16" px="6">
      <Stack gap="5">
        <Heading as="h1" textStyle="3xl">
          {title}
        </Heading>
        {children}
        {actionLabel && onAction ? (
          <Box>
            <Button onClick={onAction} colorPalette="brand">
              {actionLabel}
            </Button>
          </Box>
        ) : null}
      </Stack>
    </Box>
  );
}
