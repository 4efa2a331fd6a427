import { Button, Heading, HStack, Stack, Text } from '@chakra-ui/react';
import { QUALITY_SORT_FIELDS, type QualityListQuery, type QualitySortField } from '@steadyhand/shared';
import { Link as RouterLink, useSearchParams } from 'react-router';
import { ErrorMessage } from '../../../components/ui/error-message';
import { PageSpinner } from '../../../components/ui/page-status';
import { PageTitle } from '../../../components/ui/page-title';
import { paths } from '../../../config/paths';
import { toQueryString, useQualityCodes, type QualityListParams } from '../../../features/quality/api/get-quality-codes';
import { QualityCodeTable } from '../../../features/quality/components/quality-code-table';
import { QualityFilters } from '../../../features/quality/components/quality-filters';
import { QualityGate } from '../../../features/quality/components/quality-gate';

const FILTER_KEYS = ['from', 'to', 'unitId', 'firstRhythm', 'outcome', 'missed'] as const;
const PAGE_SIZE = 25;

function QualityList() {
  const [search, setSearch] = useSearchParams();
  const params: QualityListParams = {};
  for (const key of [...FILTER_KEYS, 'sort', 'dir', 'page'] as const) {
    const v = search.get(key);
    if (v) params[key] = v;
  }
  params.pageSize = String(PAGE_SIZE);
  const sort = (QUALITY_SORT_FIELDS as readonly string[]).includes(params.sort ?? '') ? (params.sort as QualitySortField) : 'arrestAt';
  const dir: QualityListQuery['dir'] = params.dir === 'asc' ? 'asc' : 'desc';
  const page = Math.max(1, Number(params.page ?? '1') || 1);
  const query = useQualityCodes(params);

  const update = (changes: QualityListParams, keepPage = false) => {
    const next = new URLSearchParams(search);
    for (const [k, v] of Object.entries(changes)) {
      if (v) next.set(k, v);
      else next.delete(k);
    }
    if (!keepPage) next.delete('page');
    setSearch(next, { replace: true });
  };
  const filterParams = Object.fromEntries(FILTER_KEYS.flatMap((k) => (params[k] ? [[k, params[k]]] : [])));
  const total = query.data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / PAGE_SIZE));

  return (
    <Stack gap="6">
      <HStack justify="space-between" wrap="wrap" gap="4">
        <Stack gap="1">
          <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="quality-heading">
            Quality review
          </Heading>
          <Text color="fg.muted">Every ended code against the committee&apos;s targets. Open one to read it, note it and sign the review off.</Text>
        </Stack>
        <HStack gap="3" wrap="wrap">
          <Button asChild variant="outline" size="lg">
            <RouterLink to={paths.quality.stats.getHref()}>Charts by month and unit</RouterLink>
          </Button>
          <Button asChild variant="outline" size="lg">
            <RouterLink to={paths.quality.followUp.getHref()} data-testid="quality-follow-up-link">
              Follow-up to enter
            </RouterLink>
          </Button>
          <Button asChild colorPalette="brand" size="lg">
            {/* A plain link: the browser downloads the file with the session cookie. */}
            <a href={`/api/quality/export/utstein.csv${toQueryString(filterParams)}`} download data-testid="quality-export-csv">
              Utstein CSV of these codes
            </a>
          </Button>
        </HStack>
      </HStack>

      <QualityFilters params={params} units={query.data?.units ?? []} onChange={(c) => update(c)} onClear={() => setSearch(new URLSearchParams(), { replace: true })} />

      {query.isPending ? (
        <PageSpinner label="Loading codes…" />
      ) : query.isError ? (
        <ErrorMessage title="The list could not be loaded" message={query.error.message} />
      ) : (
        <Stack gap="4">
          <Text role="status" data-testid="quality-total">
            {total === 1 ? '1 code' : `${total} codes`} match{total === 1 ? 'es' : ''}
            {total > 0 ? `; page ${page} of ${pages}` : ''}.
          </Text>
          {query.data.items.length > 0 ? (
            <QualityCodeTable
              items={query.data.items}
              sort={sort}
              dir={dir}
              onSort={(field) => update({ sort: field, dir: field === sort && dir === 'desc' ? 'asc' : 'desc' })}
            />
          ) : (
            <Text>No ended code matches these filters.</Text>
          )}
          <HStack as="nav" aria-label="Pages" gap="3">
            <Button variant="outline" disabled={page <= 1} onClick={() => update({ page: String(page - 1) }, true)}>
              Previous page
            </Button>
            <Button variant="outline" disabled={page >= pages} onClick={() => update({ page: String(page + 1) }, true)}>
              Next page
            </Button>
          </HStack>
        </Stack>
      )}
    </Stack>
  );
}

export function Component() {
  return (
    <>
      <PageTitle title="Quality review" />
      <QualityGate>
        <QualityList />
      </QualityGate>
    </>
  );
}
