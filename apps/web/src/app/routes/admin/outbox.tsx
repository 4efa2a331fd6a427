import { Alert, Box, Heading, Stack, Text } from '@chakra-ui/react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { PageSpinner } from '../../../components/ui/page-status';
import { PageTitle } from '../../../components/ui/page-title';
import { useOutbox } from '../../../features/admin/api/admin';
import { formatDateTime } from '../../../lib/format';
import { isApiError } from '../../../lib/api-client';

/** What the server would have mailed, caught by the development relay instead of sent. */
export function Component() {
  const outbox = useOutbox();
  return (
    <Stack gap="4">
      <PageTitle title="Sent mail (development)" />
      <Text color="fg.muted">
        With FAKE_SMTP=1 the server mails through a relay of its own on 127.0.0.1 that keeps every
        message here instead of delivering it. Newest first.
      </Text>
      {outbox.isPending ? <PageSpinner label="Loading the outbox…" /> : null}
      {outbox.isError ? (
        isApiError(outbox.error) && outbox.error.status === 404 ? (
          <Alert.Root status="info" variant="outline">
            <Alert.Indicator />
            <Alert.Title>
              This server sends mail through a real relay (SMTP_HOST); there is no development
              outbox.
            </Alert.Title>
          </Alert.Root>
        ) : (
          <ErrorMessage message={outbox.error.message} />
        )
      ) : null}
      {outbox.data && outbox.data.length === 0 ? <Text>No mail yet.</Text> : null}
      {outbox.data?.map((m) => (
        <Box
          as="article"
          key={`${m.receivedAt}-${m.subject}`}
          borderWidth="1px"
          borderRadius="l2"
          p="4"
          bg="bg.panel"
          data-testid="outbox-message"
        >
          <Heading as="h2" textStyle="lg">
            {m.subject}
          </Heading>
          <Text textStyle="sm" color="fg.muted">
            {formatDateTime(m.receivedAt)} · from {m.from} · to {m.to.join(', ')}
          </Text>
          <Text as="pre" whiteSpace="pre-wrap" fontFamily="inherit" mt="3">
            {m.text}
          </Text>
        </Box>
      ))}
    </Stack>
  );
}
