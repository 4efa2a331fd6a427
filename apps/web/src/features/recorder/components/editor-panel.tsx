import { Box, Button, Flex, Heading } from '@chakra-ui/react';
import { useEffect, useRef, type ReactNode } from 'react';

/**
 * A panel the recorder opened on purpose (a dose, a number, a note). Not a confirmation: nothing
 * waits on it, the clocks keep running above, and Cancel leaves the log as it was.
 */
export function EditorPanel({
  title,
  children,
  onCancel,
  testId,
  cancelLabel = 'Cancel',
  cancelTestId = 'editor-cancel',
}: {
  title: string;
  children: ReactNode;
  onCancel: () => void;
  testId: string;
  cancelLabel?: string;
  cancelTestId?: string;
}) {
  const ref = useRef<HTMLDivElement>(null);
  useEffect(() => {
    ref.current?.focus();
  }, []);
  return (
    <Box
      ref={ref}
      tabIndex={-1}
      role="region"
      aria-label={title}
      data-testid={testId}
      position="fixed"
      zIndex="overlay"
      bottom="0"
      right="0"
      left={{ base: '0', lg: 'auto' }}
      top={{ base: 'auto', lg: '0' }}
      w={{ base: 'full', lg: '26rem' }}
      maxH={{ base: '88dvh', lg: '100dvh' }}
      overflowY="auto"
      bg="white"
      borderTopWidth={{ base: '6px', lg: '0' }}
      borderLeftWidth={{ base: '0', lg: '6px' }}
      borderColor="ink.900"
      boxShadow="2xl"
      p="4"
      onKeyDown={(e) => {
        if (e.key !== 'Escape') return;
        e.stopPropagation(); // closes only the innermost panel
        onCancel();
      }}
    >
      <Flex align="center" justify="space-between" gap="3" mb="3">
        <Heading as="h2" textStyle="xl">
          {title}
        </Heading>
        <Button variant="outline" minH="12" onClick={onCancel} data-testid={cancelTestId}>
          {cancelLabel}
        </Button>
      </Flex>
      {children}
    </Box>
  );
}
