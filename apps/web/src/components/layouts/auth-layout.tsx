import { Box, Container, Flex, Heading, Stack, Text } from '@chakra-ui/react';
import type { ReactNode } from 'react';
import { BrandMark } from './brand-mark';

/** The frame for pages seen before signing in: the product's name and what it is for, then the form. */
export function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <Flex direction={{ base: 'column', lg: 'row' }} minH="100dvh">
      <Box as="header" bg="bg.header" color="fg.header" flex={{ lg: '0 0 42%' }} py={{ base: '8', lg: '16' }}>
        <Container maxW="xl" h="full">
          <Stack gap="5" justify="center" h="full">
            <Flex align="center" gap="4">
              <BrandMark size={56} />
              <Text as="span" textStyle="4xl" fontWeight="bold" letterSpacing="tight">
                Steadyhand
              </Text>
            </Flex>
            <Text textStyle="xl" color="fg.headerMuted" maxW="30rem">
              Records a resuscitation as it happens, keeps the whole team on one clock, and turns the
              event into a signed, reviewable record.
            </Text>
          </Stack>
        </Container>
      </Box>
      <Box as="main" id="main" flex="1" py={{ base: '8', lg: '16' }}>
        <Container maxW="lg">{children}</Container>
      </Box>
    </Flex>
  );
}

/** The page's own heading inside the auth frame. */
export function AuthHeading({ children }: { children: ReactNode }) {
  return (
    <Heading as="h1" textStyle="3xl" mb="6">
      {children}
    </Heading>
  );
}
