import { Button, Field, Heading, HStack, Input, Stack, Text } from '@chakra-ui/react';
import { Link as RouterLink, useSearchParams } from 'react-router';
import { ErrorMessage } from '../../../components/ui/error-message';
import { PageSpinner } from '../../../components/ui/page-status';
import { PageTitle } from '../../../components/ui/page-title';
import { paths } from '../../../config/paths';
import { useQualityStats } from '../../../features/quality/api/get-quality-stats';
import { QualityGate } from '../../../features/quality/components/quality-gate';
import { StatsCharts } from '../../../features/quality/components/stats-charts';

function QualityStatsPage() {
  const [search, setSearch] = useSearchParams();
  const from = search.get('from') ?? '';
  const to = search.get('to') ?? '';
  const query = useQualityStats({ ...(from ? { from } : {}), ...(to ? { to } : {}) });
  const set = (key: string, value: string) => {
    const next = new URLSearchParams(search);
    if (value) next.set(key, value);
    else next.delete(key);
    setSearch(next, { replace: true });
  };
  return (
    <Stack gap="6">
      <HStack justify="space-between" wrap="wrap" gap="4">
        <Stack gap="1">
          <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="quality-stats-heading">
            Across codes
          </Heading>
          <Text color="fg.muted">ROSC and survival rates with 95% confidence intervals (Wilson score interval), medians, interquartile ranges and targets met, by month and by unit, for the committee&apos;s review.</Text>
        </Stack>
        <Button asChild variant="outline" size="lg">
          <RouterLink to={paths.quality.list.getHref()}>← The list of codes</RouterLink>
        </Button>
      </HStack>
      <HStack gap="4" wrap="wrap" align="end">
        <Field.Root maxW="14rem">
          <Field.Label htmlFor="stats-from">From</Field.Label>
          <Input id="stats-from" type="date" size="lg" value={from} onChange={(e) => set('from', e.currentTarget.value)} />
        </Field.Root>
        <Field.Root maxW="14rem">
          <Field.Label htmlFor="stats-to">To</Field.Label>
          <Input id="stats-to" type="date" size="lg" value={to} onChange={(e) => set('to', e.currentTarget.value)} />
        </Field.Root>
      </HStack>
      {query.isPending ? (
        <PageSpinner label="Loading the figures…" />
      ) : query.isError ? (
        <ErrorMessage title="The figures could not be loaded" message={query.error.message} />
      ) : query.data.overall.codes === 0 ? (
        <Text>No ended code in this period.</Text>
      ) : (
        <StatsCharts stats={query.data} />
      )}
    </Stack>
  );
}

export function Component() {
  return (
    <>
      <PageTitle title="Quality figures" />
      <QualityGate>
        <QualityStatsPage />
      </QualityGate>
    </>
  );
}
