import { Badge, Box, Button, Heading, HStack, Stack, Text, Wrap } from '@chakra-ui/react';
import { ROLE_LABELS } from '@steadyhand/shared';
import { useState } from 'react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { HomePanel } from '../../../components/ui/home-panel';
import { PageSpinner } from '../../../components/ui/page-status';
import { PageTitle } from '../../../components/ui/page-title';
import { useAdminUsers } from '../../../features/admin/api/admin';
import { AddPersonForm } from '../../../features/admin/components/add-person-form';
import { PersonEditor } from '../../../features/admin/components/person-editor';
import { useCurrentUser } from '../../../lib/session/use-current-user';

export function Component() {
  const me = useCurrentUser();
  const users = useAdminUsers();
  const [open, setOpen] = useState<string | null>(null);
  const [added, setAdded] = useState<string | null>(null);

  return (
    <Stack gap="8">
      <PageTitle title="People" />
      <HomePanel testIds={['admin-add-person']} title="Add a person" description="Give them a temporary password and their roles; they choose their own password at first sign-in.">
        {added ? (
          <Text role="status" color="green.fg" fontWeight="bold">
            {added} was added.
          </Text>
        ) : null}
        <AddPersonForm onAdded={setAdded} />
      </HomePanel>
      <Stack gap="3">
        <Heading as="h2" textStyle="2xl">
          Everyone
        </Heading>
        {users.isError ? <ErrorMessage message="The list of people could not be loaded." /> : null}
        {users.data ? null : <PageSpinner label="Loading people…" />}
        {users.data?.map((person) => (
          <Box key={person.id} bg="bg.panel" borderWidth="1px" borderRadius="l3" p="4" data-testid={`person-${person.username}`} opacity={person.disabledAt ? 0.8 : 1}>
            <HStack justify="space-between" gap="4" wrap="wrap">
              <Stack gap="1">
                <Text fontWeight="bold" textStyle="lg">
                  {person.displayName}{' '}
                  <Text as="span" color="fg.muted" fontWeight="normal">
                    {person.username}
                  </Text>
                </Text>
                <Wrap gap="2">
                  {person.roles.map((r) => (
                    <Badge key={r} colorPalette="brand" variant="subtle">
                      {ROLE_LABELS[r]}
                    </Badge>
                  ))}
                  {person.roles.length === 0 ? <Badge>No roles</Badge> : null}
                  {person.disabledAt ? (
                    <Badge colorPalette="red" variant="solid" data-testid="person-disabled">
                      Disabled
                    </Badge>
                  ) : null}
                  {person.mustChangePassword ? <Badge colorPalette="orange">Must choose a password</Badge> : null}
                  {person.secondFactor ? <Badge colorPalette="green">Authenticator on</Badge> : null}
                  <Badge variant="outline">
                    {person.activeSessions} {person.activeSessions === 1 ? 'session' : 'sessions'}
                  </Badge>
                </Wrap>
              </Stack>
              <Button
                variant="outline"
                aria-expanded={open === person.id}
                aria-label={`${open === person.id ? 'Close' : 'Manage'} ${person.displayName}`}
                onClick={() => setOpen(open === person.id ? null : person.id)}
              >
                {open === person.id ? 'Close' : 'Manage'}
              </Button>
            </HStack>
            {open === person.id ? <PersonEditor person={person} isSelf={person.id === me.id} /> : null}
          </Box>
        ))}
      </Stack>
    </Stack>
  );
}
