import { Text } from '@chakra-ui/react';
import type { ReactNode } from 'react';
import { Navigate, useLocation } from 'react-router';
import { PageProblem, PageSpinner } from '../../../components/ui/page-status';
import { paths } from '../../../config/paths';
import { useMe } from '../../../lib/session/get-me';
import { CurrentUserContext } from '../../../lib/session/use-current-user';

/** The signed-in area's gate: no user, no page; the sign-in page brings the person back here. */
export function RequireSignedIn({ children }: { children: ReactNode }) {
  const location = useLocation();
  const me = useMe();

  // Right after sign-in only the short answer is cached; wait for the full one (password, second factor).
  if (me.isPending || (me.data && me.data.mustChangePassword === undefined && me.isFetching)) {
    return <PageSpinner label="Checking your sign-in…" />;
  }

  if (me.isError) {
    return (
      <PageProblem
        title="Cannot reach Steadyhand"
        actionLabel="Try again"
        onAction={() => {
          void me.refetch();
        }}
      >
        <Text>The server did not answer. Check the network connection.</Text>
      </PageProblem>
    );
  }

  if (!me.data) {
    return <Navigate to={paths.signIn.getHref(`${location.pathname}${location.search}`)} replace />;
  }

  return <CurrentUserContext value={me.data}>{children}</CurrentUserContext>;
}
