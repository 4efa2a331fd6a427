import { Box, Heading, Stack, Text } from '@chakra-ui/react';
import type { ReactNode } from 'react';

interface HomePanelProps {
  /** One test id per role the panel serves (a shared panel answers to each role's id). */
  testIds: readonly string[];
  title: string;
  description: string;
  children?: ReactNode;
}

/** One card on the home page, for one job (or two jobs that share a panel). */
export function HomePanel({ testIds, title, description, children }: HomePanelProps) {
  const headingId = `panel-${testIds.join('-')}`;
  const [outerId, ...innerIds] = testIds;
  // Each extra id gets a layout-neutral wrapper, so a test can find the panel by any of its roles.
  const body = innerIds.reduceRight<ReactNode>(
    (inner, id) => (
      <Box data-testid={id} display="contents">
        {inner}
      </Box>
    ),
    <Stack gap="4">
      <Heading as="h2" id={headingId} textStyle="2xl">
        {title}
      </Heading>
      <Text color="fg.muted">{description}</Text>
      {children}
    </Stack>,
  );
  return (
    <Box
      as="section"
      aria-labelledby={headingId}
      data-testid={outerId}
      bg="bg.panel"
      borderWidth="1px"
      borderColor="border"
      borderTopWidth="6px"
      borderTopColor="brand.solid"
      borderRadius="l3"
      p={{ base: '5', md: '7' }}
      shadow="sm"
    >
      {body}
    </Box>
  );
}
