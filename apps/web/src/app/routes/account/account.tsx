import { Badge, Button, Heading, Stack, Text } from '@chakra-ui/react';
import { useState } from 'react';
import { Link as RouterLink } from 'react-router';
import { ErrorMessage } from '../../../components/ui/error-message';
import { HomePanel } from '../../../components/ui/home-panel';
import { PageSpinner } from '../../../components/ui/page-status';
import { PageTitle } from '../../../components/ui/page-title';
import { SessionTable } from '../../../components/ui/session-table';
import { paths } from '../../../config/paths';
import { useEndMySession, useMySessions, useTotpStatus } from '../../../features/account/api/account';
import { useCurrentUser } from '../../../lib/session/use-current-user';

/** My account: where I am signed in, my password, my second factor. */
export function Component() {
  const user = useCurrentUser();
  const sessions = useMySessions();
  const end = useEndMySession();
  const totp = useTotpStatus();
  const [ending, setEnding] = useState<string | null>(null);

  return (
    <Stack gap="8">
      <PageTitle title="My account" />
      <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="account-heading">
        My account
      </Heading>
      <HomePanel testIds={['account-sessions']} title="Where you are signed in" description="End a session on a device you no longer have, or have left signed in.">
        {end.isError ? <ErrorMessage message={end.error.message} /> : null}
        {sessions.data ? (
          <SessionTable
            sessions={sessions.data}
            showPerson={false}
            ending={ending}
            onEnd={(s) => {
              setEnding(s.id);
              end.mutate(s.id, { onSettled: () => setEnding(null) });
            }}
          />
        ) : (
          <PageSpinner label="Loading your sessions…" />
        )}
      </HomePanel>
      <HomePanel testIds={['account-password']} title="Password" description="At least 12 characters; no rules about symbols. A well-known password is refused.">
        <div>
          <Button asChild variant="outline" size="lg">
            <RouterLink to={paths.account.password.getHref()}>Change my password</RouterLink>
          </Button>
        </div>
      </HomePanel>
      <HomePanel
        testIds={['account-second-factor']}
        title="Second step at sign-in"
        description={
          user.roles.includes('admin')
            ? 'Administrators need an authenticator app to open the admin pages.'
            : 'An authenticator app makes your account harder to misuse.'
        }
      >
        {totp.data?.enrolled ? (
          <Text>
            <Badge colorPalette="green" size="lg">
              On
            </Badge>{' '}
            {totp.data.recoveryCodesLeft} recovery codes left. Lost your phone? Ask an administrator to reset it.
          </Text>
        ) : (
          <div>
            <Button asChild colorPalette="brand" size="lg">
              <RouterLink to={paths.account.secondFactor.getHref()}>Set up an authenticator</RouterLink>
            </Button>
          </div>
        )}
      </HomePanel>
    </Stack>
  );
}
