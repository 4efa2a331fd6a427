import { Button, Heading, Stack } from '@chakra-ui/react';
import { protocolSettingsSchema } from '@steadyhand/shared';
import { useQuery } from '@tanstack/react-query';
import { Link as RouterLink, useParams } from 'react-router';
import { ErrorMessage } from '../../../components/ui/error-message';
import { PageSpinner } from '../../../components/ui/page-status';
import { PageTitle } from '../../../components/ui/page-title';
import { paths } from '../../../config/paths';
import { api } from '../../../lib/api-client';
import { useReconciliation } from '../../../features/pharmacy/api/pharmacy-api';
import { ReconciliationSheet } from '../../../features/pharmacy/components/reconciliation-sheet';

// The catalogue's concentrations let the page convert doses exactly as the server does.
function useProtocolSettings() {
  return useQuery({
    queryKey: ['protocol', 'settings-for-pharmacy'],
    queryFn: async () => protocolSettingsSchema.parse(((await api.get('/api/protocol')) as { protocol: unknown }).protocol),
    staleTime: 60_000,
  });
}

export function Component() {
  const { codeId = '' } = useParams();
  const reconciliation = useReconciliation(codeId);
  const protocol = useProtocolSettings();
  return (
    <Stack gap="6">
      <PageTitle title="Reconcile drugs" />
      <Stack gap="2" align="start">
        <Button asChild variant="ghost" size="sm">
          <RouterLink to={paths.pharmacy.worklist.getHref()}>← Worklist</RouterLink>
        </Button>
        <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="reconciliation-heading">
          Reconcile drugs against the tray
        </Heading>
      </Stack>
      {reconciliation.isPending ? (
        <PageSpinner label="Loading the reconciliation…" />
      ) : reconciliation.isError ? (
        <ErrorMessage title="The reconciliation did not load" message={reconciliation.error.message} />
      ) : (
        <ReconciliationSheet view={reconciliation.data} settings={protocol.data} />
      )}
    </Stack>
  );
}
