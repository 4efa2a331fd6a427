import {
  Alert,
  Button,
  Checkbox,
  Dialog,
  Field,
  Input,
  NativeSelect,
  Portal,
  SimpleGrid,
  Stack,
  Text,
  Textarea,
} from '@chakra-ui/react';
import {
  amendEntry,
  type NewEntry,
  type ProtocolSettings,
  type RecordStatus,
} from '@steadyhand/shared';
import { Controller, useForm } from 'react-hook-form';
import { ErrorMessage } from '../../../components/ui/error-message';
import { formatClockTime } from '../../../lib/format';
import { describeEntry } from '../../../lib/live/entry-words';
import { useAddRecordEntry } from '../api/records-api';
import { changesFrom, FIELDS, initialValues, type FormValues } from './correction-fields';
import type { CorrectionTarget } from './record-timeline';

interface CorrectionDialogProps {
  codeId: string;
  status: RecordStatus;
  target: CorrectionTarget | null;
  protocol: ProtocolSettings | null;
  onClose: () => void;
}

/**
 * Amend or void one entry, always with a reason. The original stays in the log beside the
 * change; after the first signature the change goes in as an addendum.
 */
export function CorrectionDialog({
  codeId,
  status,
  target,
  protocol,
  onClose,
}: CorrectionDialogProps) {
  const add = useAddRecordEntry(codeId, status);
  const form = useForm<FormValues>({
    values: target ? initialValues(target.entry) : { time: '', reason: '' },
  });
  const close = () => {
    form.reset();
    add.reset();
    onClose();
  };

  const submit = form.handleSubmit((values) => {
    if (!target) return;
    const reason = String(values.reason).trim();
    if (!reason) {
      form.setError('reason', { message: 'Say why: the reason is kept with the change.' });
      return;
    }
    let entry: NewEntry;
    const base = {
      id: crypto.randomUUID(),
      at: new Date().toISOString(),
      target: target.entry.id,
      reason,
      deviceId: 'review',
    };
    if (target.action === 'void') {
      entry = { ...base, kind: 'void' };
    } else {
      const changes = changesFrom(target.entry, values);
      if (typeof changes === 'string') {
        form.setError('root', { message: changes });
        return;
      }
      if (Object.keys(changes).length === 0) {
        form.setError('root', {
          message: 'Nothing was changed: change a value, or close this window.',
        });
        return;
      }
      // Checked here with the same rules the server applies, so a bad value is named before sending.
      const {
        original: _original,
        amendments: _amendments,
        voided: _voided,
        ...currentEntry
      } = target.entry;
      const applied = amendEntry(currentEntry, changes);
      if (!applied.ok) {
        form.setError('root', { message: applied.error });
        return;
      }
      entry = { ...base, kind: 'amend', changes };
    }
    add.mutate(entry, { onSuccess: close });
  });

  const entry = target?.entry;
  const fields = entry ? (FIELDS[entry.kind] ?? []) : [];
  const isVoid = target?.action === 'void';
  return (
    <Dialog.Root
      open={target !== null}
      onOpenChange={(d) => (d.open ? undefined : close())}
      placement="center"
      size="lg"
    >
      <Portal>
        <Dialog.Backdrop />
        <Dialog.Positioner>
          <Dialog.Content data-testid="correction-dialog">
            <form onSubmit={(e) => void submit(e)} noValidate>
              <Dialog.Header>
                <Dialog.Title textStyle="2xl">
                  {isVoid ? 'Void this entry' : 'Correct this entry'}
                </Dialog.Title>
              </Dialog.Header>
              <Dialog.Body>
                {entry ? (
                  <Stack gap="4">
                    <Text textStyle="lg">
                      <strong>{formatClockTime(entry.at)}</strong> {describeEntry(entry, protocol)}
                    </Text>
                    <Text color="fg.muted">
                      {isVoid
                        ? 'A voided entry stays in the record, struck through, and no longer counts in the summary.'
                        : 'The entry as first recorded stays in the record beside your correction.'}
                      {status !== 'draft'
                        ? ' The record is signed: this goes in as an addendum.'
                        : ''}
                    </Text>
                    {isVoid ? null : (
                      <SimpleGrid columns={{ base: 1, md: 2 }} gap="4">
                        <Field.Root>
                          <Field.Label>Time (hh:mm:ss)</Field.Label>
                          <Input
                            inputMode="numeric"
                            {...form.register('time')}
                            data-testid="correction-time"
                          />
                        </Field.Root>
                        {fields.map((field) =>
                          field.type === 'checkbox' ? (
                            <Field.Root key={field.name} justifyContent="end">
                              <Controller
                                control={form.control}
                                name={field.name}
                                render={({ field: control }) => (
                                  <Checkbox.Root
                                    checked={control.value === true}
                                    onCheckedChange={(d) => control.onChange(d.checked === true)}
                                    size="lg"
                                  >
                                    <Checkbox.HiddenInput />
                                    <Checkbox.Control />
                                    <Checkbox.Label>{field.label}</Checkbox.Label>
                                  </Checkbox.Root>
                                )}
                              />
                            </Field.Root>
                          ) : field.type === 'select' ? (
                            <Field.Root key={field.name}>
                              <Field.Label>{field.label}</Field.Label>
                              <NativeSelect.Root>
                                <NativeSelect.Field
                                  {...form.register(field.name)}
                                  data-testid={`correction-${field.name}`}
                                >
                                  {field.options.map((o) => (
                                    <option key={o.value} value={o.value}>
                                      {o.label}
                                    </option>
                                  ))}
                                </NativeSelect.Field>
                                <NativeSelect.Indicator />
                              </NativeSelect.Root>
                            </Field.Root>
                          ) : (
                            <Field.Root key={field.name}>
                              <Field.Label>{field.label}</Field.Label>
                              <Input
                                type={field.type === 'number' ? 'number' : 'text'}
                                step={field.type === 'number' ? field.step : undefined}
                                inputMode={field.type === 'number' ? 'decimal' : undefined}
                                {...form.register(field.name)}
                                data-testid={`correction-${field.name}`}
                              />
                            </Field.Root>
                          ),
                        )}
                      </SimpleGrid>
                    )}
                    {!isVoid && (entry.kind === 'drug' || entry.kind === 'shock') ? (
                      <Alert.Root status="warning" variant="outline">
                        <Alert.Indicator />
                        <Alert.Title>
                          Check a corrected dose or energy against the source (the drug box, the
                          defibrillator log) before you save it.
                        </Alert.Title>
                      </Alert.Root>
                    ) : null}
                    <Field.Root invalid={form.formState.errors.reason !== undefined} required>
                      <Field.Label>Reason</Field.Label>
                      <Textarea
                        rows={2}
                        {...form.register('reason')}
                        placeholder="e.g. Dose read from the syringe label after the code"
                        data-testid="correction-reason"
                      />
                      <Field.ErrorText>{form.formState.errors.reason?.message}</Field.ErrorText>
                    </Field.Root>
                    {form.formState.errors.root?.message ? (
                      <ErrorMessage
                        title="Not saved"
                        message={form.formState.errors.root.message}
                      />
                    ) : null}
                    {add.error ? (
                      <ErrorMessage title="Not saved" message={add.error.message} />
                    ) : null}
                  </Stack>
                ) : null}
              </Dialog.Body>
              <Dialog.Footer gap="3">
                <Button variant="outline" size="lg" onClick={close}>
                  Cancel
                </Button>
                <Button
                  type="submit"
                  colorPalette={isVoid ? 'red' : 'brand'}
                  size="lg"
                  loading={add.isPending}
                  loadingText="Saving…"
                  data-testid="correction-save"
                >
                  {isVoid ? 'Void the entry' : 'Save the correction'}
                </Button>
              </Dialog.Footer>
            </form>
          </Dialog.Content>
        </Dialog.Positioner>
      </Portal>
    </Dialog.Root>
  );
}
