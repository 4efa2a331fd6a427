import { Stack, Text } from '@chakra-ui/react';
import { useState } from 'react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { PageSpinner } from '../../../components/ui/page-status';
import { PageTitle } from '../../../components/ui/page-title';
import { SessionTable } from '../../../components/ui/session-table';
import { useAllSessions, useEndSession } from '../../../features/admin/api/admin';

export function Component() {
  const sessions = useAllSessions();
  const end = useEndSession();
  const [ending, setEnding] = useState<string | null>(null);
  return (
    <Stack gap="4">
      <PageTitle title="Sessions" />
      <Text color="fg.muted">Everyone signed in now. Ending a session signs that device out at once, live screens too.</Text>
      {end.isError ? <ErrorMessage message={end.error.message} /> : null}
      {sessions.data ? (
        <SessionTable
          sessions={sessions.data}
          showPerson
          ending={ending}
          onEnd={(s) => {
            setEnding(s.id);
            end.mutate(s.id, { onSettled: () => setEnding(null) });
          }}
        />
      ) : (
        <PageSpinner label="Loading sessions…" />
      )}
    </Stack>
  );
}
