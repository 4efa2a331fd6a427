import { Alert, Button, Heading, Stack, Text } from '@chakra-ui/react';
import { Link as RouterLink } from 'react-router';
import { PageTitle } from '../../../components/ui/page-title';
import { paths } from '../../../config/paths';
import { useCurrentUser } from '../../../lib/session/use-current-user';
import { ProtocolSettingsEditor } from '../../../features/protocol/components/protocol-settings-editor';

/** Protocol settings: admins only (the server refuses everyone else too; this says why up front). */
export function Component() {
  const user = useCurrentUser();
  const isAdmin = user.roles.includes('admin');
  return (
    <Stack gap="6">
      <PageTitle title="Protocol settings" />
      <Stack gap="2">
        <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="protocol-heading">
          Protocol settings
        </Heading>
        <Text color="fg.muted">The local protocol behind every timer, reminder, energy preset and dose suggestion.</Text>
      </Stack>
      {isAdmin ? (
        <ProtocolSettingsEditor />
      ) : (
        <Stack gap="5">
          <Alert.Root status="info" variant="outline" borderWidth="2px" borderRadius="l3" data-testid="protocol-needs-admin">
            <Alert.Indicator />
            <Alert.Content>
              <Alert.Title textStyle="xl" fontWeight="bold">
                This page needs the administrator role.
              </Alert.Title>
              <Alert.Description textStyle="lg">
                Only an administrator can change the protocol settings. If you think you should, ask your Steadyhand administrator.
              </Alert.Description>
            </Alert.Content>
          </Alert.Root>
          <div>
            <Button asChild variant="outline" size="lg">
              <RouterLink to={paths.home.getHref()}>Back to home</RouterLink>
            </Button>
          </div>
        </Stack>
      )}
    </Stack>
  );
}
