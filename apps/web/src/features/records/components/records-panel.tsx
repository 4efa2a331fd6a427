import { Button, Stack, Text, Wrap } from '@chakra-ui/react';
import type { Role } from '@steadyhand/shared';
import { Link as RouterLink } from 'react-router';
import { HomePanel } from '../../../components/ui/home-panel';
import { paths } from '../../../config/paths';
import { formatDateTime } from '../../../lib/format';
import { useRecordsList } from '../api/records-api';
import { RecordStatusBadge } from './record-status-badge';

/** Home panel for recorders and leaders: ended codes whose record still needs a signature. */
export function RecordsPanel({ roles }: { roles: readonly Role[] }) {
  const records = useRecordsList();
  const waiting = records.data?.filter((r) => r.status !== 'signed') ?? [];
  return (
    <HomePanel
      testIds={roles.map((role) => `home-records-${role}`)}
      title="Records to sign"
      description="After a code: complete the details, correct the timeline, attach strips, then the recorder and the team leader each sign."
    >
      {records.isPending ? <Text role="status">Loading…</Text> : null}
      {records.data && waiting.length === 0 ? <Text>Every ended code is signed.</Text> : null}
      {waiting.length > 0 ? (
        <Stack as="ul" gap="2" listStyleType="none">
          {waiting.slice(0, 5).map(({ code, status }) => (
            <li key={code.id}>
              <Button
                asChild
                variant="outline"
                size="lg"
                w="full"
                justifyContent="space-between"
                data-testid="home-record"
              >
                <RouterLink to={paths.codes.review.getHref(code.id)}>
                  <span>
                    {code.location ?? 'Location not recorded'}, {formatDateTime(code.arrestAt)}
                  </span>
                  <RecordStatusBadge status={status} />
                </RouterLink>
              </Button>
            </li>
          ))}
        </Stack>
      ) : null}
      <Wrap gap="3">
        <Button asChild colorPalette="brand" variant="ghost">
          <RouterLink to={paths.records.list.getHref()}>
            All code records{waiting.length > 5 ? ` (${waiting.length} waiting)` : ''}
          </RouterLink>
        </Button>
        <Button asChild colorPalette="brand" variant="ghost">
          <RouterLink to={paths.records.verify.getHref()}>Check a printed record</RouterLink>
        </Button>
      </Wrap>
    </HomePanel>
  );
}
