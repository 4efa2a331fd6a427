import { Badge, Code, Table, Text } from '@chakra-ui/react';
import type { BackupCheck, BackupCopy } from '@steadyhand/shared';
import { formatBytes, formatDateTime } from '../../../lib/format';

/** What a copy's check found, in one line a person can act on. */
export function describeBackupCheck(check: BackupCheck | null): string {
  if (!check) return 'Not checked: the check did not finish. Take a new copy (pnpm db:backup).';
  if (check.error) return `The check could not run: ${check.error}`;
  if (check.integrity.length !== 1 || check.integrity[0] !== 'ok') return `SQLite integrity check failed: ${check.integrity.slice(0, 3).join('; ')}`;
  const parts = [`${check.codes} codes, ${check.entries} entries`];
  parts.push(
    check.brokenChains.length
      ? `entry chain broken in ${check.brokenChains.map((b) => `code ${b.codeId} at entry ${b.brokenAt.position}`).join(', ')}`
      : 'every entry chain verifies',
  );
  parts.push(
    check.attachments.missing.length
      ? `${check.attachments.missing.length} of ${check.attachments.count} attachments missing`
      : `${check.attachments.count} attachments present`,
  );
  return parts.join(' · ');
}

/** The copies in BACKUP_DIR, newest first, each with its check. */
export function BackupTable({ copies }: { copies: BackupCopy[] }) {
  if (copies.length === 0) return <Text color="fg.muted">No copies yet.</Text>;
  return (
    <Table.ScrollArea borderWidth="1px" borderRadius="l2" tabIndex={0} role="region" aria-label="Backups, scrolls sideways">
      <Table.Root size="md" data-testid="backup-table">
        <Table.Header>
          <Table.Row>
            <Table.ColumnHeader>Taken</Table.ColumnHeader>
            <Table.ColumnHeader>File</Table.ColumnHeader>
            <Table.ColumnHeader textAlign="end">Size</Table.ColumnHeader>
            <Table.ColumnHeader>Check</Table.ColumnHeader>
          </Table.Row>
        </Table.Header>
        <Table.Body>
          {copies.map((c) => (
            <Table.Row key={c.file} data-testid="backup-row" data-check={c.check?.ok ? 'ok' : 'failed'}>
              <Table.Cell>{formatDateTime(c.createdAt)}</Table.Cell>
              <Table.Cell>
                <Code>{c.file}</Code>
              </Table.Cell>
              <Table.Cell textAlign="end">{formatBytes(c.sizeBytes)}</Table.Cell>
              <Table.Cell>
                <Badge colorPalette={c.check?.ok ? 'green' : 'red'} variant="solid" me="2">
                  {c.check?.ok ? 'Passed' : 'Failed'}
                </Badge>
                {describeBackupCheck(c.check)}
              </Table.Cell>
            </Table.Row>
          ))}
        </Table.Body>
      </Table.Root>
    </Table.ScrollArea>
  );
}
