import { Alert, Button, CloseButton, Container } from '@chakra-ui/react';
import { isApiError } from '../../../lib/api-client';
import type { SignOutState } from '../hooks/use-sign-out';

export function SignOutButton({ state }: { state: SignOutState }) {
  return (
    <Button
      variant="outline"
      colorPalette="ink"
      color="fg.header"
      borderColor="ink.400"
      _hover={{ bg: 'ink.700' }}
      loading={state.isPending}
      loadingText="Signing out…"
      onClick={() => {
        void state.signOut();
      }}
    >
      Sign out
    </Button>
  );
}

/** Why sign-out was refused, directly under the header where the person just tapped. */
export function SignOutNotice({ state }: { state: SignOutState }) {
  if (!state.error) return null;
  const message = isApiError(state.error)
    ? state.error.message
    : 'Steadyhand could not be reached to sign you out. Check the network connection and try again.';
  return (
    <Container maxW="6xl" pt="4">
      <Alert.Root status="warning" role="alert" borderRadius="l2" alignItems="center">
        <Alert.Indicator />
        <Alert.Content>
          <Alert.Title textStyle="lg" fontWeight="bold">
            You are still signed in
          </Alert.Title>
          <Alert.Description textStyle="lg">{message}</Alert.Description>
        </Alert.Content>
        <CloseButton aria-label="Dismiss" size="md" onClick={state.dismissError} />
      </Alert.Root>
    </Container>
  );
}
