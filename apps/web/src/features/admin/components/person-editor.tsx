import { Button, Field, HStack, Input, Separator, Stack, Text } from '@chakra-ui/react';
import { newPasswordSchema, type AdminUser, type Role } from '@steadyhand/shared';
import { useState } from 'react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { isApiError } from '../../../lib/api-client';
import { useRenameUser, useResetPassword, useResetSecondFactor, useSetDisabled, useSetRoles } from '../api/admin';
import { RoleCheckboxes } from './role-checkboxes';

const errorText = (error: unknown) => (isApiError(error) ? error.message : 'Cannot reach Steadyhand.');

/** Everything an admin changes about one person; each change is saved (and audited) on its own. */
export function PersonEditor({ person, isSelf }: { person: AdminUser; isSelf: boolean }) {
  const rename = useRenameUser();
  const setRoles = useSetRoles();
  const resetPassword = useResetPassword();
  const setDisabled = useSetDisabled();
  const resetSecondFactor = useResetSecondFactor();
  const [name, setName] = useState(person.displayName);
  const [roles, setRoleList] = useState<Role[]>(person.roles);
  const [password, setPassword] = useState('');
  const [notice, setNotice] = useState<string | null>(null);
  const passwordProblem = password && !newPasswordSchema.safeParse(password).success ? 'Use at least 12 characters' : null;
  const failed = [rename, setRoles, resetPassword, setDisabled, resetSecondFactor].find((m) => m.isError);
  const done = (message: string) => () => setNotice(message);

  return (
    <Stack gap="5" pt="4" data-testid={`person-editor-${person.username}`}>
      {failed ? <ErrorMessage message={errorText(failed.error)} /> : null}
      {notice ? (
        <Text role="status" color="green.fg" fontWeight="bold">
          {notice}
        </Text>
      ) : null}
      <HStack align="flex-end" gap="3" wrap="wrap">
        <Field.Root maxW="sm">
          <Field.Label>Full name</Field.Label>
          <Input value={name} onChange={(e) => setName(e.target.value)} bg="bg.panel" />
        </Field.Root>
        <Button variant="outline" disabled={!name.trim() || name === person.displayName} loading={rename.isPending} onClick={() => rename.mutate({ id: person.id, displayName: name.trim() }, { onSuccess: done('Name saved.') })}>
          Save name
        </Button>
      </HStack>
      <Stack gap="3">
        <RoleCheckboxes legend="Roles" name={`roles-${person.id}`} value={roles} onChange={setRoleList} />
        <div>
          <Button variant="outline" loading={setRoles.isPending} onClick={() => setRoles.mutate({ id: person.id, roles }, { onSuccess: done('Roles saved.') })}>
            Save roles
          </Button>
        </div>
      </Stack>
      <Separator />
      <HStack align="flex-end" gap="3" wrap="wrap">
        <Field.Root maxW="sm" invalid={Boolean(passwordProblem)}>
          <Field.Label>Temporary password</Field.Label>
          <Input type="password" autoComplete="new-password" value={password} onChange={(e) => setPassword(e.target.value)} bg="bg.panel" />
          <Field.ErrorText>{passwordProblem}</Field.ErrorText>
        </Field.Root>
        <Button
          variant="outline"
          disabled={!password || Boolean(passwordProblem)}
          loading={resetPassword.isPending}
          onClick={() =>
            resetPassword.mutate(
              { id: person.id, password },
              { onSuccess: () => { setPassword(''); setNotice('Password reset: they are signed out and must choose a new one.'); } },
            )
          }
        >
          Reset password
        </Button>
      </HStack>
      <HStack gap="3" wrap="wrap">
        {person.secondFactor ? (
          <Button variant="outline" loading={resetSecondFactor.isPending} onClick={() => resetSecondFactor.mutate(person.id, { onSuccess: done('Authenticator removed: they set up a new one next time.') })}>
            Reset authenticator
          </Button>
        ) : null}
        {isSelf ? null : person.disabledAt ? (
          <Button colorPalette="brand" loading={setDisabled.isPending} onClick={() => setDisabled.mutate({ id: person.id, disabled: false }, { onSuccess: done('Enabled.') })}>
            Enable account
          </Button>
        ) : (
          <Button colorPalette="red" loading={setDisabled.isPending} onClick={() => setDisabled.mutate({ id: person.id, disabled: true }, { onSuccess: done('Disabled: every session of theirs has ended.') })}>
            Disable account
          </Button>
        )}
      </HStack>
    </Stack>
  );
}
