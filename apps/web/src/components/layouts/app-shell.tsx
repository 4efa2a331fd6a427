import { Box, Container, Flex, HStack, Link, Text } from '@chakra-ui/react';
import { useEffect, useRef, type ReactNode } from 'react';
import { Link as RouterLink, useLocation, useMatch } from 'react-router';
import { paths } from '../../config/paths';
import { BrandMark } from './brand-mark';

interface AppShellProps {
  /** Who is signed in, shown in the header. */
  userName: string;
  /** Header controls on the right (sign-out). */
  actions?: ReactNode;
  /** A full-width message under the header (for example why sign-out was refused). */
  notice?: ReactNode;
  children: ReactNode;
}

/** The frame around every signed-in page: ink header, skip link, one main region. */
export function AppShell({ userName, actions, notice, children }: AppShellProps) {
  const mainRef = useRef<HTMLElement>(null);
  const location = useLocation();
  const firstRender = useRef(true);
  // The recorder pad needs every pixel of a tablet: full width, little padding.
  const onPad = useMatch(paths.codes.record.path) !== null;

  // After moving to another page, put keyboard and screen-reader focus at the new content.
  useEffect(() => {
    if (firstRender.current) {
      firstRender.current = false;
      return;
    }
    mainRef.current?.focus();
  }, [location.pathname]);

  return (
    // On a tablet the pad is exactly one screen high: it must never need scrolling.
    <Flex direction="column" minH="100dvh" h={onPad ? { base: 'auto', md: '100dvh' } : undefined}>
      <SkipLink />
      <Box as="header" bg="bg.header" color="fg.header">
        <Container maxW={onPad ? 'full' : '6xl'} py={onPad ? '1' : '3'}>
          <Flex align="center" justify="space-between" gap="4" wrap="wrap">
            <Link
              asChild
              color="fg.header"
              textDecoration="none"
              _hover={{ textDecoration: 'underline' }}
              minH="12"
              display="inline-flex"
              alignItems="center"
              gap="3"
            >
              <RouterLink to={paths.home.getHref()}>
                <BrandMark />
                <Text as="span" textStyle="2xl" fontWeight="bold">
                  Steadyhand
                </Text>
              </RouterLink>
            </Link>
            <HStack gap="4" wrap="wrap">
              <Text as="span" textStyle="lg" color="fg.headerMuted">
                Signed in as{' '}
                <Text as="span" color="fg.header" fontWeight="bold">
                  {userName}
                </Text>
              </Text>
              {actions}
            </HStack>
          </Flex>
        </Container>
      </Box>
      {notice}
      <Box
        as="main"
        id="main"
        ref={mainRef}
        tabIndex={-1}
        flex="1"
        minH="0"
        outline="none"
        _focusVisible={{ outline: 'none' }}
      >
        <Container
          maxW={onPad ? 'full' : '6xl'}
          px={onPad ? { base: '3', md: '4' } : undefined}
          py={onPad ? '2' : { base: '6', md: '10' }}
          h={onPad ? { base: 'auto', md: 'full' } : undefined}
        >
          {children}
        </Container>
      </Box>
    </Flex>
  );
}

function SkipLink() {
  return (
    <Link
      href="#main"
      position="absolute"
      left="2"
      top="-20"
      zIndex="skipLink"
      bg="white"
      color="ink.900"
      px="4"
      py="3"
      fontWeight="bold"
      borderRadius="l2"
      _focus={{ top: '2' }}
    >
      Skip to main content
    </Link>
  );
}
