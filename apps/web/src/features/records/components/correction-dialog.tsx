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
  ACCESS_ROUTES,
  AIRWAY_DEVICES,
  amendEntry,
  DOSE_UNITS,
  doseUnitLabel,
  DRUG_ROUTES,
  OUTCOMES,
  RHYTHMS,
  type ClinicalEntry,
  type EffectiveEntry,
  type NewEntry,
  type ProtocolSettings,
  type RecordStatus,
} from '@steadyhand/shared';
import { Controller, useForm } from 'react-hook-form';
import { ErrorMessage } from '../../../components/ui/error-message';
import { formatClockTime } from '../../../lib/format';
import {
  AIRWAY_WORDS,
  describeEntry,
  OUTCOME_WORDS,
  RHYTHM_WORDS,
  ROUTE_WORDS,
} from '../../../lib/live/entry-words';
import { useAddRecordEntry } from '../api/records-api';
import type { CorrectionTarget } from './record-timeline';

/** One editable field of an entry; every kind lists only the fields a person may correct. */
type FieldSpec =
  | { name: string; label: string; type: 'number'; step?: string }
  | { name: string; label: string; type: 'text' }
  | {
      name: string;
      label: string;
      type: 'select';
      options: readonly { value: string; label: string }[];
    }
  | { name: string; label: string; type: 'checkbox' };

const options = <T extends string>(values: readonly T[], words?: Partial<Record<T, string>>) =>
  values.map((value) => ({ value, label: words?.[value] ?? value }));

const FIELDS: Partial<Record<ClinicalEntry['kind'], FieldSpec[]>> = {
  drug: [
    { name: 'dose', label: 'Dose', type: 'number', step: 'any' },
    {
      name: 'unit',
      label: 'Unit',
      type: 'select',
      options: DOSE_UNITS.map((u) => ({ value: u, label: doseUnitLabel(u) })),
    },
    { name: 'route', label: 'Route', type: 'select', options: options(DRUG_ROUTES, ROUTE_WORDS) },
  ],
  shock: [
    { name: 'joules', label: 'Energy (J)', type: 'number', step: '1' },
    { name: 'synchronized', label: 'Synchronised', type: 'checkbox' },
  ],
  rhythm: [
    { name: 'rhythm', label: 'Rhythm', type: 'select', options: options(RHYTHMS, RHYTHM_WORDS) },
    { name: 'pulse', label: 'Pulse present', type: 'checkbox' },
  ],
  etco2: [{ name: 'mmHg', label: 'ETCO2 (mmHg)', type: 'number', step: '1' }],
  lab: [
    { name: 'value', label: 'Value', type: 'number', step: 'any' },
    { name: 'unit', label: 'Unit', type: 'text' },
  ],
  note: [{ name: 'text', label: 'Note', type: 'text' }],
  access: [
    {
      name: 'route',
      label: 'Route',
      type: 'select',
      options: options(ACCESS_ROUTES, { iv: 'IV', io: 'IO' }),
    },
    { name: 'site', label: 'Site', type: 'text' },
  ],
  airway: [
    {
      name: 'device',
      label: 'Device',
      type: 'select',
      options: options(AIRWAY_DEVICES, AIRWAY_WORDS),
    },
  ],
  end: [
    {
      name: 'outcome',
      label: 'Outcome',
      type: 'select',
      options: options(OUTCOMES, OUTCOME_WORDS),
    },
  ],
};

type FormValues = Record<string, string | boolean>;

/** "07:42:10" on the entry's own day, back to an ISO time (the reader's time zone, as shown). */
function withClockTime(iso: string, clock: string): string | null {
  const match = /^(\d{1,2}):(\d{2})(?::(\d{2}))?$/.exec(clock.trim());
  if (!match) return null;
  const [h, m, s] = [Number(match[1]), Number(match[2]), Number(match[3] ?? 0)];
  if (h > 23 || m > 59 || s > 59) return null;
  const d = new Date(iso);
  d.setHours(h, m, s, 0);
  return d.toISOString();
}

function initialValues(entry: EffectiveEntry): FormValues {
  const values: FormValues = { time: formatClockTime(entry.at), reason: '' };
  for (const field of FIELDS[entry.kind] ?? []) {
    const current = (entry as Record<string, unknown>)[field.name];
    if (field.type === 'checkbox') values[field.name] = current === true;
    else
      values[field.name] =
        typeof current === 'string' || typeof current === 'number' ? String(current) : '';
  }
  return values;
}

/** Only the fields that differ from the entry as it now reads, typed as the entry's schema wants. */
function changesFrom(entry: EffectiveEntry, values: FormValues): Record<string, unknown> | string {
  const changes: Record<string, unknown> = {};
  const at = withClockTime(entry.at, String(values.time));
  if (!at) return 'Time: write it as hh:mm:ss, for example 07:43:40.';
  if (at !== new Date(entry.at).toISOString()) changes.at = at;
  for (const field of FIELDS[entry.kind] ?? []) {
    const raw = values[field.name];
    const current = (entry as Record<string, unknown>)[field.name];
    let next: unknown = raw;
    if (field.type === 'number') {
      if (String(raw).trim() === '') return `${field.label}: enter a number.`;
      next = Number(raw);
      if (!Number.isFinite(next)) return `${field.label}: enter a number.`;
    } else if (field.type === 'text') {
      next = String(raw).trim();
      if (next === '' && current === undefined) continue;
    }
    if (next !== current) changes[field.name] = next;
  }
  return changes;
}

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
