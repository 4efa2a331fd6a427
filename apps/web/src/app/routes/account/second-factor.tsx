import { Heading, Stack, Text } from '@chakra-ui/react';
import { useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useNavigate, useSearchParams } from 'react-router';
import { PageTitle } from '../../../components/ui/page-title';
import { paths } from '../../../config/paths';
import { SecondFactorSetup } from '../../../features/account/components/second-factor-setup';
import { meQueryKey } from '../../../lib/session/get-me';
import { SecondFactorForm } from '../../../features/auth/components/second-factor-form';
import { useCurrentUser } from '../../../lib/session/use-current-user';
import { safeNextPath } from '../../../lib/next-path';

/** Set up the authenticator, or (already set up) confirm it for this session before the admin pages. */
export function Component() {
  const user = useCurrentUser();
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const [searchParams] = useSearchParams();
  const rawNext = searchParams.get('next');
  const next = safeNextPath(rawNext, paths.account.home.path);
  const done = async () => {
    await queryClient.invalidateQueries({ queryKey: meQueryKey });
    await navigate(next, { replace: true });
  };
  // Decided once: the set-up turns `enrolled` on before its recovery codes have been read.
  const [enrolled] = useState(user.secondFactor?.enrolled ?? false);

  return (
    <Stack gap="6" maxW="3xl">
      <PageTitle title="Second step at sign-in" />
      <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="second-factor-heading">
        {enrolled ? 'Confirm it is you' : 'Set up your authenticator'}
      </Heading>
      {rawNext && user.roles.includes('admin') ? (
        <Text data-testid="second-factor-reason">The admin pages need a second step at sign-in, with an authenticator app.</Text>
      ) : null}
      {enrolled ? <SecondFactorForm stepUp onDone={() => void done()} /> : <SecondFactorSetup onDone={() => void done()} />}
    </Stack>
  );
}
