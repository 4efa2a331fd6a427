import { Alert, Code, Stack, Text } from '@chakra-ui/react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { PageSpinner } from '../../../components/ui/page-status';
import { PageTitle } from '../../../components/ui/page-title';
import { useBackups } from '../../../features/admin/api/admin';
import { BackupTable } from '../../../features/admin/components/backup-table';
import { formatDateTime } from '../../../lib/format';

/** The database copies the server made (and `pnpm db:backup`), with what each check found. */
export function Component() {
  const backups = useBackups();
  const newest = backups.data?.copies[0];
  return (
    <Stack gap="4">
      <PageTitle title="Backups" />
      {backups.data ? (
        <Text color="fg.muted">
          {backups.data.intervalMinutes > 0
            ? `The server copies the database every ${backups.data.intervalMinutes} minutes`
            : 'The schedule is off (BACKUP_INTERVAL_MINUTES=0); copies come from pnpm db:backup'}{' '}
          into <Code>{backups.data.dir}</Code> and keeps the newest {backups.data.keep}. Each copy is
          checked after it is written: SQLite&apos;s integrity check, the entry chain of every code,
          and its attachments. Restore one with <Code>pnpm db:restore &lt;file&gt;</Code> while the
          server is stopped.
        </Text>
      ) : null}
      {backups.isPending ? <PageSpinner label="Loading backups…" /> : null}
      {backups.isError ? <ErrorMessage message={backups.error.message} /> : null}
      {newest && !newest.check?.ok ? (
        <Alert.Root status="error" variant="outline" borderWidth="2px" data-testid="backup-alarm">
          <Alert.Indicator />
          <Alert.Content>
            <Alert.Title>The newest copy ({formatDateTime(newest.createdAt)}) did not pass its check.</Alert.Title>
            <Alert.Description>
              It may not restore cleanly. Look at the server&apos;s log and take a new copy.
            </Alert.Description>
          </Alert.Content>
        </Alert.Root>
      ) : null}
      {backups.data ? <BackupTable copies={backups.data.copies} /> : null}
    </Stack>
  );
}
