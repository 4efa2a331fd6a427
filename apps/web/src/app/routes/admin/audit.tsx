import { Stack } from '@chakra-ui/react';
import { PageTitle } from '../../../components/ui/page-title';
import { AuditViewer } from '../../../features/admin/components/audit-viewer';

export function Component() {
  return (
    <Stack gap="4">
      <PageTitle title="Audit trail" />
      <AuditViewer />
    </Stack>
  );
}
