import { Button, Field, Heading, HStack, NativeSelect, Stack, Text } from '@chakra-ui/react';
import { Link as RouterLink, useSearchParams } from 'react-router';
import { ErrorMessage } from '../../../components/ui/error-message';
import { PageSpinner } from '../../../components/ui/page-status';
import { PageTitle } from '../../../components/ui/page-title';
import { paths } from '../../../config/paths';
import { useFollowUpList } from '../../../features/quality/api/follow-up';
import { FollowUpTable } from '../../../features/quality/components/follow-up-table';
import { QualityGate } from '../../../features/quality/components/quality-gate';

function FollowUpList() {
  const [search, setSearch] = useSearchParams();
  const unitId = search.get('unitId') ?? '';
  const query = useFollowUpList(unitId);
  const total = query.data?.total ?? 0;
  return (
    <Stack gap="6">
      <HStack justify="space-between" wrap="wrap" gap="4">
        <Stack gap="1">
          <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="follow-up-heading">
            Follow-up to enter
          </Heading>
          <Text color="fg.muted">
            Ended codes still waiting for survival to discharge, the status at 30 days or the
            neurological outcome, oldest first. Open one to enter what the chart says.
          </Text>
        </Stack>
        <Button asChild variant="outline" size="lg">
          <RouterLink to={paths.quality.list.getHref()}>← The list of codes</RouterLink>
        </Button>
      </HStack>
      <Field.Root maxW="22rem">
        <Field.Label htmlFor="follow-up-unit">Unit</Field.Label>
        <NativeSelect.Root size="lg">
          <NativeSelect.Field
            id="follow-up-unit"
            data-testid="follow-up-filter-unit"
            value={unitId}
            onChange={(e) =>
              setSearch(e.currentTarget.value ? { unitId: e.currentTarget.value } : {}, {
                replace: true,
              })
            }
          >
            <option value="">Every unit</option>
            {(query.data?.units ?? []).map((u) => (
              <option key={u.id} value={u.id}>
                {u.name}
              </option>
            ))}
          </NativeSelect.Field>
          <NativeSelect.Indicator />
        </NativeSelect.Root>
      </Field.Root>
      {query.isPending ? (
        <PageSpinner label="Loading codes…" />
      ) : query.isError ? (
        <ErrorMessage title="The list could not be loaded" message={query.error.message} />
      ) : (
        <Stack gap="4">
          <Text role="status" data-testid="follow-up-total">
            {total === 0
              ? 'No code is waiting for its follow-up.'
              : total === 1
                ? '1 code is waiting.'
                : `${total} codes are waiting.`}
            {total > query.data.items.length
              ? ` The oldest ${query.data.items.length} are shown.`
              : ''}
          </Text>
          {query.data.items.length > 0 ? (
            <FollowUpTable
              items={query.data.items}
              hrefOf={(id) => paths.quality.code.getHref(id)}
            />
          ) : null}
        </Stack>
      )}
    </Stack>
  );
}

export function Component() {
  return (
    <>
      <PageTitle title="Follow-up to enter" />
      <QualityGate>
        <FollowUpList />
      </QualityGate>
    </>
  );
}
