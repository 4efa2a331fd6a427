import { Alert, Heading, Stack, Text } from '@chakra-ui/react';
import { useNavigate, useSearchParams } from 'react-router';
import { PageTitle } from '../../../components/ui/page-title';
import { ChangePasswordForm } from '../../../features/account/components/change-password-form';
import { useCurrentUser } from '../../../lib/session/use-current-user';
import { safeNextPath } from '../../../lib/next-path';

export function Component() {
  const user = useCurrentUser();
  const navigate = useNavigate();
  const [searchParams] = useSearchParams();
  const next = safeNextPath(searchParams.get('next'));
  return (
    <Stack gap="6">
      <PageTitle title="Change password" />
      <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="password-heading">
        Change password
      </Heading>
      {user.mustChangePassword ? (
        <Alert.Root status="warning" borderRadius="l2" data-testid="must-change-password">
          <Alert.Indicator />
          <Alert.Description textStyle="lg">
            An administrator set a temporary password for you. Choose your own to continue.
          </Alert.Description>
        </Alert.Root>
      ) : (
        <Text color="fg.muted">Changing your password signs you out on your other devices.</Text>
      )}
      <ChangePasswordForm onChanged={() => void navigate(next, { replace: true })} />
    </Stack>
  );
}
