import { Button } from '@chakra-ui/react';
import { Link as RouterLink, Outlet } from 'react-router';
import { AppShell } from '../../components/layouts/app-shell';
import { paths } from '../../config/paths';
import { AccountGate } from '../../features/auth/components/account-gate';
import { RequireSignedIn } from '../../features/auth/components/require-signed-in';
import { SignOutButton, SignOutNotice } from '../../features/auth/components/sign-out-control';
import { useCurrentUser } from '../../lib/session/use-current-user';
import { useSignOut } from '../../features/auth/hooks/use-sign-out';

/** The signed-in area: a guard, then the app frame around whichever page is open. */
export function Component() {
  return (
    <RequireSignedIn>
      <SignedInFrame />
    </RequireSignedIn>
  );
}

function SignedInFrame() {
  const user = useCurrentUser();
  const signOut = useSignOut();
  return (
    <AppShell
      userName={user.displayName}
      actions={
        <>
          <Button asChild variant="ghost" color="fg.header" _hover={{ bg: 'ink.700' }}>
            <RouterLink to={paths.account.home.getHref()}>My account</RouterLink>
          </Button>
          <SignOutButton state={signOut} />
        </>
      }
      notice={<SignOutNotice state={signOut} />}
    >
      <AccountGate>
        <Outlet />
      </AccountGate>
    </AppShell>
  );
}
