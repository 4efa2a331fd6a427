import { Heading, Stack, Text } from '@chakra-ui/react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { PageSpinner } from '../../../components/ui/page-status';
import { PageTitle } from '../../../components/ui/page-title';
import { useCurrentUser } from '../../../lib/session/use-current-user';
import { useTrays } from '../../../features/pharmacy/api/pharmacy-api';
import { TrayTemplates } from '../../../features/pharmacy/components/tray-templates';

export function Component() {
  const user = useCurrentUser();
  const canRead = user.roles.includes('admin') || user.roles.includes('pharmacist');
  const trays = useTrays();
  return (
    <Stack gap="6">
      <PageTitle title="Tray templates" />
      <Stack gap="2">
        <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="trays-heading">
          Code-cart trays
        </Heading>
        <Text color="fg.muted">What each cart&apos;s drug tray holds, in what strength and how many.</Text>
      </Stack>
      {!canRead ? (
        <ErrorMessage title="This page is for pharmacists and administrators." message="Ask your Steadyhand administrator if you need it." />
      ) : trays.isPending ? (
        <PageSpinner label="Loading trays…" />
      ) : trays.isError ? (
        <ErrorMessage title="The trays did not load" message={trays.error.message} />
      ) : (
        <TrayTemplates trays={trays.data.trays} units={trays.data.units} canEdit={user.roles.includes('admin')} />
      )}
    </Stack>
  );
}
