import { Button, Heading, HStack, Stack, Text } from '@chakra-ui/react';
import { Link as RouterLink } from 'react-router';
import { ErrorMessage } from '../../../components/ui/error-message';
import { PageSpinner } from '../../../components/ui/page-status';
import { PageTitle } from '../../../components/ui/page-title';
import { paths } from '../../../config/paths';
import { useRecordsList } from '../../../features/records/api/records-api';
import { RecordsTable } from '../../../features/records/components/records-table';

export function Component() {
  const records = useRecordsList();
  const waiting = records.data?.filter((r) => r.status !== 'signed') ?? [];
  const signed = records.data?.filter((r) => r.status === 'signed') ?? [];
  return (
    <Stack gap="8">
      <PageTitle title="Code records" />
      <HStack justify="space-between" wrap="wrap" gap="4">
        <Stack gap="1">
          <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="records-heading">
            Code records
          </Heading>
          <Text color="fg.muted">
            Each ended code: complete the details, correct the timeline, attach strips, and sign
            (the recorder, then the team leader).
          </Text>
        </Stack>
        <Button asChild variant="outline" size="lg">
          <RouterLink to={paths.records.verify.getHref()}>Check a printed record</RouterLink>
        </Button>
      </HStack>
      {records.isPending ? <PageSpinner label="Loading the records…" /> : null}
      {records.isError ? <ErrorMessage message={records.error.message} /> : null}
      {records.data ? (
        <>
          <Stack gap="3" as="section" aria-labelledby="waiting-heading">
            <Heading as="h2" id="waiting-heading" textStyle="2xl">
              Waiting for signatures ({waiting.length})
            </Heading>
            <RecordsTable records={waiting} empty="Every ended code is signed." />
          </Stack>
          <Stack gap="3" as="section" aria-labelledby="signed-heading">
            <Heading as="h2" id="signed-heading" textStyle="2xl">
              Signed ({signed.length})
            </Heading>
            <RecordsTable records={signed} empty="No signed records yet." />
          </Stack>
        </>
      ) : null}
    </Stack>
  );
}
