import { Outlet } from 'react-router';
import { AppShell } from '../../components/layouts/app-shell';
import { RequireSignedIn } from '../../features/auth/components/require-signed-in';
import { SignOutButton, SignOutNotice } from '../../features/auth/components/sign-out-control';
import { useCurrentUser } from '../../features/auth/hooks/use-current-user';
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
      actions={<SignOutButton state={signOut} />}
      notice={<SignOutNotice state={signOut} />}
    >
      <Outlet />
    </AppShell>
  );
}
