import { Badge, Button, Heading, SimpleGrid, Stack, Text, Wrap } from '@chakra-ui/react';
import { ROLE_LABELS, ROLES, WRITER_ROLES, type Role } from '@steadyhand/shared';
import { Link as RouterLink } from 'react-router';
import { HomePanel } from '../../components/ui/home-panel';
import { PageTitle } from '../../components/ui/page-title';
import { paths } from '../../config/paths';
import { useCurrentUser } from '../../lib/session/use-current-user';
import { LiveCodesPanel } from '../../features/codes/components/live-codes-panel';
import { RecordsPanel } from '../../features/records/components/records-panel';

// What each after-the-code job will find here; the pages themselves arrive later.
const COMING_PANELS: Partial<Record<Role, { title: string; description: string }>> = {
  pharmacist: {
    title: 'Drug reconciliation',
    description:
      'Codes waiting for you to match every drug given against the tray that was opened, flag differences and sign off the restock.',
  },
  reviewer: {
    title: 'Quality review',
    description:
      'Finished records to read against guideline targets (time to first compression, shock and epinephrine; compression fraction), annotate and export for the registry.',
  },
  admin: {
    title: 'People and places',
    description:
      'People and their roles, units, rooms and beds, sessions and the audit trail; the protocol, drug catalogue and tray templates.',
  },
};

export function Component() {
  const user = useCurrentUser();
  const held = ROLES.filter((role) => user.roles.includes(role));
  const writerRoles = held.filter((role) => WRITER_ROLES.includes(role));

  return (
    <Stack gap="8">
      <PageTitle title="Home" />
      <Stack gap="3">
        <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="home-heading">
          Hello, {user.displayName}
        </Heading>
        {held.length > 0 ? (
          <Wrap gap="2" align="center" aria-label="Your roles">
            <Text as="span" color="fg.muted">
              Your roles:
            </Text>
            {held.map((role) => (
              <Badge key={role} colorPalette="brand" variant="subtle" size="lg" data-testid={`home-role-${role}`}>
                {ROLE_LABELS[role]}
              </Badge>
            ))}
          </Wrap>
        ) : (
          <Text>You have no roles yet. Ask an administrator to give you one.</Text>
        )}
      </Stack>

      <SimpleGrid columns={{ base: 1, lg: writerRoles.length > 0 || held.length > 1 ? 2 : 1 }} gap="6">
        {writerRoles.length > 0 ? <LiveCodesPanel roles={writerRoles} /> : null}
        {writerRoles.length > 0 ? <RecordsPanel roles={writerRoles} /> : null}
        {held.map((role) => {
          const panel = COMING_PANELS[role];
          return panel ? (
            <HomePanel key={role} testIds={[`home-panel-${role}`]} title={panel.title} description={panel.description}>
              {role === 'admin' ? (
                <Wrap gap="3">
                  <Button asChild colorPalette="brand" size="lg" data-testid="home-admin-area">
                    <RouterLink to={paths.admin.area.getHref()}>People, places and audit trail</RouterLink>
                  </Button>
                  <Button asChild colorPalette="brand" size="lg">
                    <RouterLink to={paths.admin.protocol.getHref()}>Protocol settings</RouterLink>
                  </Button>
                </Wrap>
              ) : null}
              {role === 'pharmacist' || role === 'admin' ? (
                <Wrap gap="3">
                  {role === 'pharmacist' ? (
                    <Button asChild colorPalette="brand" size="lg" data-testid="home-pharmacy-worklist">
                      <RouterLink to={paths.pharmacy.worklist.getHref()}>Codes to reconcile</RouterLink>
                    </Button>
                  ) : null}
                  <Button asChild variant="outline" size="lg">
                    <RouterLink to={paths.pharmacy.trays.getHref()}>Tray templates</RouterLink>
                  </Button>
                </Wrap>
              ) : null}
              {role === 'reviewer' || role === 'admin' ? (
                <Wrap gap="3">
                  <Button asChild colorPalette="brand" size="lg" variant={role === 'admin' ? 'outline' : 'solid'}>
                    <RouterLink to={paths.quality.list.getHref()}>{role === 'admin' ? 'Quality review' : 'Codes to review'}</RouterLink>
                  </Button>
                  {role === 'reviewer' ? (
                    <>
                      <Button asChild variant="outline" size="lg">
                        <RouterLink to={paths.quality.followUp.getHref()}>Follow-up to enter</RouterLink>
                      </Button>
                      <Button asChild variant="outline" size="lg">
                        <RouterLink to={paths.quality.stats.getHref()}>Charts by month and unit</RouterLink>
                      </Button>
                    </>
                  ) : null}
                </Wrap>
              ) : null}
              {role === 'reviewer' || role === 'pharmacist' || role === 'admin' ? null : (
                <Text textStyle="md" color="fg.muted">
                  Coming soon.
                </Text>
              )}
            </HomePanel>
          ) : null;
        })}
      </SimpleGrid>
      {writerRoles.length === 0 ? (
        <Button asChild variant="ghost" colorPalette="brand" alignSelf="start">
          <RouterLink to={paths.records.verify.getHref()}>Check a printed code record</RouterLink>
        </Button>
      ) : null}
    </Stack>
  );
}
