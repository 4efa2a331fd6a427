import { Text } from '@chakra-ui/react';
import { useNavigate, useSearchParams } from 'react-router';
import { AuthHeading, AuthLayout } from '../../components/layouts/auth-layout';
import { PageTitle } from '../../components/ui/page-title';
import { DemoAccounts } from '../../features/auth/components/demo-accounts';
import { SignInForm } from '../../features/auth/components/sign-in-form';
import { safeNextPath } from '../../lib/next-path';

export function Component() {
  const navigate = useNavigate();
  const [searchParams] = useSearchParams();
  const rawNext = searchParams.get('next');
  const next = safeNextPath(rawNext);

  return (
    <AuthLayout>
      <PageTitle title="Sign in" />
      <AuthHeading>Sign in</AuthHeading>
      {rawNext ? (
        <Text mb="6" color="fg.muted">
          Sign in to continue where you were.
        </Text>
      ) : null}
      <SignInForm
        onSignedIn={() => {
          void navigate(next, { replace: true });
        }}
        renderHelp={(fillUsername) => <DemoAccounts onPick={fillUsername} />}
      />
    </AuthLayout>
  );
}
