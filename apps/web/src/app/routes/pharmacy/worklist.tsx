import { Button, Heading, HStack, Stack, Text } from '@chakra-ui/react';
import { Link as RouterLink } from 'react-router';
import { ErrorMessage } from '../../../components/ui/error-message';
import { PageSpinner } from '../../../components/ui/page-status';
import { PageTitle } from '../../../components/ui/page-title';
import { paths } from '../../../config/paths';
import { useCurrentUser } from '../../../lib/session/use-current-user';
import { useTrays, useWorklist } from '../../../features/pharmacy/api/pharmacy-api';
import { CartRestockSection } from '../../../features/pharmacy/components/cart-restock';
import { Worklist } from '../../../features/pharmacy/components/worklist';

export function Component() {
  const user = useCurrentUser();
  const pharmacist = user.roles.includes('pharmacist');
  const worklist = useWorklist();
  // The units and the tray each cart carries, as on the tray templates page.
  const trays = useTrays();
  return (
    <Stack gap="6">
      <PageTitle title="Drug reconciliation" />
      <Stack gap="2">
        <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="pharmacy-heading">
          Drug reconciliation
        </Heading>
        <Text color="fg.muted">Codes that have ended and wait for you to count the tray, oldest first.</Text>
        <HStack>
          <Button asChild variant="outline">
            <RouterLink to={paths.pharmacy.trays.getHref()}>Tray templates</RouterLink>
          </Button>
        </HStack>
      </Stack>
      {!pharmacist ? (
        <ErrorMessage title="This page needs the pharmacist role." message="Only a pharmacist reconciles drugs." />
      ) : worklist.isPending ? (
        <PageSpinner label="Loading the worklist…" />
      ) : worklist.isError ? (
        <ErrorMessage title="The worklist did not load" message={worklist.error.message} />
      ) : (
        <Worklist codes={worklist.data} hrefOf={(id) => paths.pharmacy.code.getHref(id)} />
      )}
      {!pharmacist ? null : trays.isError ? (
        <ErrorMessage title="The units did not load" message={trays.error.message} />
      ) : trays.data ? (
        <CartRestockSection units={trays.data.units} hrefOf={(id) => paths.pharmacy.code.getHref(id)} />
      ) : null}
    </Stack>
  );
}
