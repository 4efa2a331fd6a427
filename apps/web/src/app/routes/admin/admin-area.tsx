import { Alert, Box, Heading, HStack, Link, Stack, Text } from '@chakra-ui/react';
import { Navigate, NavLink, Outlet, useLocation } from 'react-router';
import { PageTitle } from '../../../components/ui/page-title';
import { paths } from '../../../config/paths';
import { useCurrentUser } from '../../../lib/session/use-current-user';

const SECTIONS = [
  { to: paths.admin.people.getHref(), label: 'People' },
  { to: paths.admin.places.getHref(), label: 'Places' },
  { to: paths.admin.sessions.getHref(), label: 'Sessions' },
  { to: paths.admin.audit.getHref(), label: 'Audit trail' },
  { to: paths.admin.protocol.getHref(), label: 'Protocol settings' },
  { to: paths.admin.backups.getHref(), label: 'Backups' },
  { to: paths.admin.outbox.getHref(), label: 'Sent mail' },
];

/** The admin area's frame: a heading, its sections as tabs, and the open section. */
export function Component() {
  const user = useCurrentUser();
  const location = useLocation();
  if (!user.roles.includes('admin')) {
    return (
      <Alert.Root status="info" variant="outline" borderWidth="2px" borderRadius="l3" data-testid="admin-needs-admin">
        <Alert.Indicator />
        <Alert.Content>
          <Alert.Title textStyle="xl">This area needs the administrator role.</Alert.Title>
          <Alert.Description textStyle="lg">Ask your Steadyhand administrator if you think you should have it.</Alert.Description>
        </Alert.Content>
      </Alert.Root>
    );
  }
  // /admin opens the first section, so its tab shows as the current one.
  if (location.pathname === paths.admin.area.path) return <Navigate to={paths.admin.people.getHref()} replace />;
  return (
    <Stack gap="6">
      <PageTitle title="Administration" />
      <Stack gap="1">
        <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="admin-heading">
          Administration
        </Heading>
        <Text color="fg.muted">People, places, who is signed in, and who did what. Every change here is in the audit trail.</Text>
      </Stack>
      <Box as="nav" aria-label="Administration sections" borderBottomWidth="2px" borderColor="border">
        <HStack gap="1" wrap="wrap">
          {SECTIONS.map((s) => (
            <Link key={s.to} asChild px="4" py="3" fontWeight="bold" textDecoration="none" borderBottomWidth="4px" borderColor="transparent" mb="-2px" _currentPage={{ borderColor: 'brand.solid', color: 'brand.fg' }}>
              <NavLink to={s.to} end>
                {s.label}
              </NavLink>
            </Link>
          ))}
        </HStack>
      </Box>
      <Outlet />
    </Stack>
  );
}
