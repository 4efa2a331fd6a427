import { Alert, Button, Dialog, Field, Input, Portal, Stack, Text } from '@chakra-ui/react';
import { zodResolver } from '@hookform/resolvers/zod';
import { signReconciliationSchema, type ReconciliationView, type SignReconciliationRequest } from '@steadyhand/shared';
import { useForm } from 'react-hook-form';
import { ErrorMessage } from '../../../components/ui/error-message';
import { useSignReconciliation } from '../api/pharmacy-api';

interface SignOffDialogProps {
  open: boolean;
  onClose: () => void;
  view: ReconciliationView;
  /** From the sheet as saved just now. */
  counts: { drugs: number; discrepancies: number };
}

/** Sign-off with the password again: what it means is said in words before the button. */
export function SignOffDialog({ open, onClose, view, counts }: SignOffDialogProps) {
  const sign = useSignReconciliation(view.code.id);
  const form = useForm<SignReconciliationRequest>({ resolver: zodResolver(signReconciliationSchema), defaultValues: { password: '' } });
  const close = () => {
    form.reset();
    sign.reset();
    onClose();
  };
  const submit = form.handleSubmit((values) => sign.mutate(values, { onSuccess: close }));
  return (
    <Dialog.Root open={open} onOpenChange={(d) => (d.open ? undefined : close())} placement="center" role="alertdialog">
      <Portal>
        <Dialog.Backdrop />
        <Dialog.Positioner>
          <Dialog.Content data-testid="sign-off-dialog">
            <form onSubmit={(e) => void submit(e)} noValidate>
              <Dialog.Header>
                <Dialog.Title textStyle="2xl">Sign off this reconciliation</Dialog.Title>
              </Dialog.Header>
              <Dialog.Body>
                <Stack gap="4">
                  <Text textStyle="lg">
                    You confirm that the counts for {counts.drugs} drug{counts.drugs === 1 ? '' : 's'} given are as you found them. After this, changes go in
                    only as addenda.
                  </Text>
                  {counts.discrepancies > 0 ? (
                    <Alert.Root status="error" variant="outline">
                      <Alert.Indicator />
                      <Alert.Title>
                        ▲ {counts.discrepancies} drug{counts.discrepancies === 1 ? ' has a discrepancy' : 's have discrepancies'}: the pharmacy lead gets an e-mail.
                      </Alert.Title>
                    </Alert.Root>
                  ) : null}
                  {!view.code.recordSigned ? (
                    <Alert.Root status="warning" variant="outline">
                      <Alert.Indicator />
                      <Alert.Title>● The code record is not signed yet: its drug totals could still change.</Alert.Title>
                    </Alert.Root>
                  ) : null}
                  <Field.Root invalid={form.formState.errors.password !== undefined} required>
                    <Field.Label>Your password</Field.Label>
                    <Input type="password" autoComplete="current-password" {...form.register('password')} data-testid="sign-off-password" />
                    <Field.ErrorText>{form.formState.errors.password?.message}</Field.ErrorText>
                  </Field.Root>
                  {sign.error ? <ErrorMessage title="Not signed" message={sign.error.message} /> : null}
                </Stack>
              </Dialog.Body>
              <Dialog.Footer gap="3">
                <Button variant="outline" size="lg" onClick={close}>
                  Not yet
                </Button>
                <Button type="submit" colorPalette="brand" size="lg" loading={sign.isPending} loadingText="Signing…" data-testid="confirm-sign-off">
                  Sign off
                </Button>
              </Dialog.Footer>
            </form>
          </Dialog.Content>
        </Dialog.Positioner>
      </Portal>
    </Dialog.Root>
  );
}
