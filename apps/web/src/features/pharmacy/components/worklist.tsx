import { Badge, Button, Table, Text } from '@chakra-ui/react';
import type { WorklistItem } from '@steadyhand/shared';
import { Link as RouterLink } from 'react-router';

const when = (iso: string | null) => (iso ? new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone: 'UTC' }) : '—');

/** Codes awaiting reconciliation, oldest first (the server's order). */
export function Worklist({ codes, hrefOf }: { codes: WorklistItem[]; hrefOf: (codeId: string) => string }) {
  if (codes.length === 0) return <Text textStyle="lg" data-testid="worklist-empty">No codes are waiting for reconciliation.</Text>;
  return (
    <Table.ScrollArea borderWidth="1px" borderRadius="l2">
      <Table.Root size="md" data-testid="worklist">
        <Table.Header>
          <Table.Row>
            <Table.ColumnHeader>Arrest (UTC)</Table.ColumnHeader>
            <Table.ColumnHeader>Where</Table.ColumnHeader>
            <Table.ColumnHeader>Record</Table.ColumnHeader>
            <Table.ColumnHeader textAlign="end">Drugs given</Table.ColumnHeader>
            <Table.ColumnHeader>Discrepancies</Table.ColumnHeader>
            <Table.ColumnHeader>Reconciliation</Table.ColumnHeader>
          </Table.Row>
        </Table.Header>
        <Table.Body>
          {codes.map((c) => (
            <Table.Row key={c.codeId} data-testid={`worklist-row-${c.codeId}`}>
              <Table.Cell>{when(c.arrestAt)}</Table.Cell>
              <Table.Cell>{c.unitName ?? c.location ?? 'Not recorded'}</Table.Cell>
              <Table.Cell>
                {c.recordSigned ? (
                  <Badge colorPalette="green">✓ Signed</Badge>
                ) : (
                  <Badge colorPalette="orange" variant="outline">
                    ● Not yet signed
                  </Badge>
                )}
              </Table.Cell>
              <Table.Cell textAlign="end">
                {c.drugs} ({c.doses} dose{c.doses === 1 ? '' : 's'})
              </Table.Cell>
              <Table.Cell>
                {c.discrepancies > 0 ? (
                  <Badge colorPalette="red" variant="solid">
                    ▲ {c.discrepancies} to account for
                  </Badge>
                ) : (
                  <Badge colorPalette="green">✓ None</Badge>
                )}
              </Table.Cell>
              <Table.Cell>
                <Button asChild size="sm" colorPalette="brand" variant={c.status === 'draft' ? 'outline' : 'solid'}>
                  <RouterLink to={hrefOf(c.codeId)}>{c.status === 'draft' ? 'Continue' : 'Reconcile'}</RouterLink>
                </Button>
              </Table.Cell>
            </Table.Row>
          ))}
        </Table.Body>
      </Table.Root>
    </Table.ScrollArea>
  );
}
