import { Box, Button, Code, Field, HStack, Input, NativeSelect, SimpleGrid, Stack, Table, Text } from '@chakra-ui/react';
import { useState } from 'react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { auditQueryString, useAdminUsers, useAudit, type AuditFilters } from '../api/admin';

const summary = (detail: Record<string, unknown> | null) => (detail ? JSON.stringify(detail).slice(0, 160) : '');

/** Who did what and when: filter by person, code and dates; newest first; CSV for the same filters. */
export function AuditViewer() {
  const people = useAdminUsers();
  const [draft, setDraft] = useState<AuditFilters>({});
  const [filters, setFilters] = useState<AuditFilters>({});
  const [page, setPage] = useState(1);
  const audit = useAudit(filters, page);
  const set = (key: keyof AuditFilters) => (e: { target: { value: string } }) => setDraft((d) => ({ ...d, [key]: e.target.value }));
  const pages = audit.data ? Math.max(1, Math.ceil(audit.data.total / audit.data.pageSize)) : 1;

  return (
    <Stack gap="6">
      <form
        aria-label="Filter the audit trail"
        onSubmit={(e) => {
          e.preventDefault();
          setFilters(draft);
          setPage(1);
        }}
      >
        <SimpleGrid columns={{ base: 1, md: 4 }} gap="4" alignItems="end">
          <Field.Root>
            <Field.Label>Person</Field.Label>
            <NativeSelect.Root>
              <NativeSelect.Field value={draft.person ?? ''} onChange={set('person')} bg="bg.panel">
                <option value="">Everyone</option>
                {people.data?.map((p) => (
                  <option key={p.id} value={p.username}>
                    {p.displayName} ({p.username})
                  </option>
                ))}
              </NativeSelect.Field>
              <NativeSelect.Indicator />
            </NativeSelect.Root>
          </Field.Root>
          <Field.Root>
            <Field.Label>Code id</Field.Label>
            <Input value={draft.codeId ?? ''} onChange={set('codeId')} bg="bg.panel" spellCheck={false} />
          </Field.Root>
          <Field.Root>
            <Field.Label>From (day)</Field.Label>
            <Input type="date" value={draft.from ?? ''} onChange={set('from')} bg="bg.panel" />
          </Field.Root>
          <Field.Root>
            <Field.Label>To (day)</Field.Label>
            <Input type="date" value={draft.to ?? ''} onChange={set('to')} bg="bg.panel" />
          </Field.Root>
        </SimpleGrid>
        <HStack mt="4" gap="3" wrap="wrap">
          <Button type="submit" colorPalette="brand">
            Show
          </Button>
          <Button asChild variant="outline">
            <a href={`/api/admin/audit.csv${auditQueryString(filters)}`} download>
              Download CSV
            </a>
          </Button>
          {audit.data ? (
            <Text color="fg.muted" role="status">
              {audit.data.total} {audit.data.total === 1 ? 'event' : 'events'}
            </Text>
          ) : null}
        </HStack>
      </form>
      {audit.isError ? <ErrorMessage message="The audit trail could not be loaded." /> : null}
      <Table.ScrollArea borderWidth="1px" borderRadius="l2" tabIndex={0} role="region" aria-label="Audit trail, scrolls sideways">
        <Table.Root size="sm" data-testid="audit-table">
          <Table.Header>
            <Table.Row>
              <Table.ColumnHeader>When (UTC)</Table.ColumnHeader>
              <Table.ColumnHeader>Who</Table.ColumnHeader>
              <Table.ColumnHeader>What</Table.ColumnHeader>
              <Table.ColumnHeader>Code</Table.ColumnHeader>
              <Table.ColumnHeader>Details</Table.ColumnHeader>
            </Table.Row>
          </Table.Header>
          <Table.Body>
            {audit.data?.events.map((e) => (
              <Table.Row key={e.id}>
                <Table.Cell whiteSpace="nowrap">{e.at.replace('T', ' ').slice(0, 19)}</Table.Cell>
                <Table.Cell>{e.username ?? '—'}</Table.Cell>
                <Table.Cell>
                  <Code>{e.action}</Code>
                </Table.Cell>
                <Table.Cell>{e.codeId ? e.codeId.slice(0, 8) : ''}</Table.Cell>
                <Table.Cell>
                  <Box as="span" fontSize="sm" color="fg.muted" wordBreak="break-all">
                    {summary(e.detail)}
                  </Box>
                </Table.Cell>
              </Table.Row>
            ))}
          </Table.Body>
        </Table.Root>
      </Table.ScrollArea>
      <HStack gap="3">
        <Button variant="outline" disabled={page <= 1} onClick={() => setPage((p) => p - 1)}>
          Newer
        </Button>
        <Text>
          Page {page} of {pages}
        </Text>
        <Button variant="outline" disabled={page >= pages} onClick={() => setPage((p) => p + 1)}>
          Older
        </Button>
      </HStack>
    </Stack>
  );
}
