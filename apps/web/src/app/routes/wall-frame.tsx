import { Box } from '@chakra-ui/react';
import { Outlet } from 'react-router';
import { AccountGate } from '../../features/auth/components/account-gate';
import { RequireSignedIn } from '../../features/auth/components/require-signed-in';
import { useMe } from '../../lib/session/get-me';
import { CurrentUserContext } from '../../lib/session/use-current-user';

/**
 * The frame of the wall screens: signed in (any role may watch), dark, no app header. Once the
 * person is known the wall keeps showing even when the server stops answering: the wall itself
 * says it has lost the link, rather than the frame replacing it with an error page.
 */
export function Component() {
  const me = useMe();
  const page = (
    <Box minH="100dvh" bg="ink.950" color="white" colorPalette="ink">
      <AccountGate>
        <Outlet />
      </AccountGate>
    </Box>
  );
  if (me.data) return <CurrentUserContext value={me.data}>{page}</CurrentUserContext>;
  return <RequireSignedIn>{page}</RequireSignedIn>;
}
