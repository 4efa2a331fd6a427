import { Alert, Button, Stack } from '@chakra-ui/react';
import { hasAnyRole } from '@steadyhand/shared';
import type { ReactNode } from 'react';
import { Link as RouterLink } from 'react-router';
import { paths } from '../../../config/paths';
import { useCurrentUser } from '../../../lib/session/use-current-user';

/** Reviewers and admins only (the server refuses everyone else too; this says why up front). */
export function QualityGate({ children }: { children: ReactNode }) {
  const user = useCurrentUser();
  if (hasAnyRole(user.roles, ['reviewer', 'admin'])) return <>{children}</>;
  return (
    <Stack gap="5">
      <Alert.Root status="info" variant="outline" borderWidth="2px" borderRadius="l3" data-testid="quality-needs-reviewer">
        <Alert.Indicator />
        <Alert.Content>
          <Alert.Title textStyle="xl" fontWeight="bold">
            This page needs the quality reviewer role.
          </Alert.Title>
          <Alert.Description textStyle="lg">Quality review is open to quality reviewers and administrators.</Alert.Description>
        </Alert.Content>
      </Alert.Root>
      <div>
        <Button asChild variant="outline" size="lg">
          <RouterLink to={paths.home.getHref()}>Back to home</RouterLink>
        </Button>
      </div>
    </Stack>
  );
}
