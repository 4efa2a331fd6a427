import { Badge, Box, Button, Checkbox, Field, Flex, Heading, HStack, Input, NativeSelect, Stack, Table, Text } from '@chakra-ui/react';
import { zodResolver } from '@hookform/resolvers/zod';
import { DOSE_UNITS, formatStrength, trayTemplateInputSchema, UNIT_WORDS, type PharmacyUnit, type TrayTemplate } from '@steadyhand/shared';
import { useState } from 'react';
import { Controller, useFieldArray, useForm } from 'react-hook-form';
import type { z } from 'zod';
import { ErrorMessage } from '../../../components/ui/error-message';
import { useAssignTray, useSaveTray } from '../api/pharmacy-api';
import { ExpiryBadge } from './expiry-badge';

/** Tray templates and cart assignments; admins edit, pharmacists read. */
export function TrayTemplates({ trays, units, canEdit }: { trays: TrayTemplate[]; units: PharmacyUnit[]; canEdit: boolean }) {
  const [editing, setEditing] = useState<TrayTemplate | 'new' | null>(null);
  return (
    <Stack gap="8">
      <Stack gap="3">
        <Heading as="h2" textStyle="2xl">
          Which tray each cart carries
        </Heading>
        <UnitAssignments trays={trays} units={units} canEdit={canEdit} />
      </Stack>
      <Stack gap="4">
        <Flex justify="space-between" align="center" wrap="wrap" gap="3">
          <Heading as="h2" textStyle="2xl">
            Tray templates
          </Heading>
          {canEdit && editing === null ? (
            <Button colorPalette="brand" onClick={() => setEditing('new')}>
              New tray
            </Button>
          ) : null}
        </Flex>
        {editing !== null ? <TrayEditor tray={editing === 'new' ? null : editing} onDone={() => setEditing(null)} /> : null}
        {trays.map((tray) => (
          <Box key={tray.id} borderWidth="1px" borderRadius="l2" p="4" data-testid={`tray-${tray.name}`}>
            <Flex justify="space-between" align="center" mb="2" gap="3" wrap="wrap">
              <HStack>
                <Heading as="h3" textStyle="lg">
                  {tray.name}
                </Heading>
                {!tray.active ? <Badge>Not in use</Badge> : null}
              </HStack>
              {canEdit && editing === null ? (
                <Button size="sm" variant="outline" onClick={() => setEditing(tray)}>
                  Edit {tray.name}
                </Button>
              ) : null}
            </Flex>
            <Table.Root size="sm">
              <Table.Header>
                <Table.Row>
                  <Table.ColumnHeader>Drug</Table.ColumnHeader>
                  <Table.ColumnHeader>Strength</Table.ColumnHeader>
                  <Table.ColumnHeader textAlign="end">Quantity</Table.ColumnHeader>
                  <Table.ColumnHeader>Controlled</Table.ColumnHeader>
                  <Table.ColumnHeader>Lot</Table.ColumnHeader>
                  <Table.ColumnHeader>Expiry</Table.ColumnHeader>
                </Table.Row>
              </Table.Header>
              <Table.Body>
                {tray.items.map((item) => (
                  <Table.Row key={item.id}>
                    <Table.Cell>{item.label}</Table.Cell>
                    <Table.Cell>{formatStrength(item)}</Table.Cell>
                    <Table.Cell textAlign="end">{item.quantity}</Table.Cell>
                    <Table.Cell>{item.controlled ? 'Yes' : 'No'}</Table.Cell>
                    <Table.Cell>{item.lot ?? 'Not recorded'}</Table.Cell>
                    <Table.Cell data-testid={`expiry-${tray.name}-${item.drugKey}`}>
                      <HStack gap="2" wrap="wrap">
                        <Text as="span">{item.expiry ?? 'Not recorded'}</Text>
                        <ExpiryBadge expiry={item.expiry} />
                      </HStack>
                    </Table.Cell>
                  </Table.Row>
                ))}
              </Table.Body>
            </Table.Root>
          </Box>
        ))}
        <Text color="fg.muted" textStyle="sm">
          Lot and expiry are those of the units now on the tray: update them when the cart is restocked. An item that has expired or expires
          within 30 days is flagged here and on the restock list. Lots opened at a code are written on its reconciliation. Strengths are set by
          your pharmacy; the demo tray uses common practice.
        </Text>
      </Stack>
    </Stack>
  );
}

function UnitAssignments({ trays, units, canEdit }: { trays: TrayTemplate[]; units: PharmacyUnit[]; canEdit: boolean }) {
  const assign = useAssignTray();
  if (units.length === 0) return <Text>No units yet: an administrator adds them under places.</Text>;
  return (
    <Stack gap="2">
      {units.map((unit) => (
        <Flex key={unit.id} gap="4" align="center" wrap="wrap">
          <Text minW="14rem" fontWeight="bold">
            {unit.name}
          </Text>
          {canEdit ? (
            <NativeSelect.Root maxW="20rem" disabled={assign.isPending}>
              <NativeSelect.Field
                aria-label={`Tray for ${unit.name}`}
                value={unit.trayId ?? ''}
                onChange={(e) => assign.mutate({ unitId: unit.id, trayId: e.target.value || null })}
              >
                <option value="">No tray</option>
                {trays.map((t) => (
                  <option key={t.id} value={t.id}>
                    {t.name}
                  </option>
                ))}
              </NativeSelect.Field>
              <NativeSelect.Indicator />
            </NativeSelect.Root>
          ) : (
            <Text>{unit.trayName ?? 'No tray'}</Text>
          )}
        </Flex>
      ))}
      {assign.error ? <ErrorMessage message={assign.error.message} /> : null}
    </Stack>
  );
}

type TrayForm = z.input<typeof trayTemplateInputSchema>;
type TrayOutput = z.output<typeof trayTemplateInputSchema>;

const blankItem = { drugKey: '', label: '', strengthAmount: 1, strengthUnit: 'mg' as const, volumeMl: null, quantity: 1, controlled: false, lot: null, expiry: null };
const nullIfEmpty = (v: string | null) => (v === '' || v === null ? null : v);

function TrayEditor({ tray, onDone }: { tray: TrayTemplate | null; onDone: () => void }) {
  const save = useSaveTray();
  const form = useForm<TrayForm, unknown, TrayOutput>({
    resolver: zodResolver(trayTemplateInputSchema),
    defaultValues: tray
      ? { name: tray.name, active: tray.active, items: tray.items.map(({ sortOrder: _s, ...item }) => item) }
      : { name: '', active: true, items: [blankItem] },
  });
  const items = useFieldArray({ control: form.control, name: 'items' });
  const errors = form.formState.errors;
  const submit = form.handleSubmit((body) => save.mutate({ id: tray?.id ?? null, body }, { onSuccess: onDone }));
  return (
    <form onSubmit={(e) => void submit(e)} noValidate>
      <Stack gap="4" borderWidth="2px" borderColor="brand.solid" borderRadius="l2" p="4">
        <Field.Root invalid={errors.name !== undefined} required maxW="28rem">
          <Field.Label>Tray name</Field.Label>
          <Input {...form.register('name')} />
          <Field.ErrorText>{errors.name?.message}</Field.ErrorText>
        </Field.Root>
        {items.fields.map((field, i) => {
          const e = errors.items?.[i];
          return (
            <Flex key={field.id} gap="2" wrap="wrap" align="end">
              <Field.Root w="9rem" invalid={e?.drugKey !== undefined}>
                <Field.Label>Drug key</Field.Label>
                <Input {...form.register(`items.${i}.drugKey`)} />
                <Field.ErrorText>{e?.drugKey?.message}</Field.ErrorText>
              </Field.Root>
              <Field.Root w="12rem" invalid={e?.label !== undefined}>
                <Field.Label>Label</Field.Label>
                <Input {...form.register(`items.${i}.label`)} />
              </Field.Root>
              <Field.Root w="6rem" invalid={e?.strengthAmount !== undefined}>
                <Field.Label>Amount</Field.Label>
                <Input type="number" step="any" {...form.register(`items.${i}.strengthAmount`, { valueAsNumber: true })} />
              </Field.Root>
              <Field.Root w="6rem">
                <Field.Label>Unit</Field.Label>
                <NativeSelect.Root>
                  <NativeSelect.Field {...form.register(`items.${i}.strengthUnit`)}>
                    {DOSE_UNITS.map((u) => (
                      <option key={u} value={u}>
                        {UNIT_WORDS[u]}
                      </option>
                    ))}
                  </NativeSelect.Field>
                  <NativeSelect.Indicator />
                </NativeSelect.Root>
              </Field.Root>
              <Field.Root w="6rem" invalid={e?.volumeMl !== undefined}>
                <Field.Label>In mL</Field.Label>
                <Input type="number" step="any" {...form.register(`items.${i}.volumeMl`, { setValueAs: (v: string) => (v === '' || v === null ? null : Number(v)) })} />
              </Field.Root>
              <Field.Root w="5rem" invalid={e?.quantity !== undefined}>
                <Field.Label>Qty</Field.Label>
                <Input type="number" {...form.register(`items.${i}.quantity`, { valueAsNumber: true })} />
              </Field.Root>
              <Field.Root w="9rem" invalid={e?.lot !== undefined}>
                <Field.Label>Lot</Field.Label>
                <Input {...form.register(`items.${i}.lot`, { setValueAs: nullIfEmpty })} autoComplete="off" />
                <Field.ErrorText>{e?.lot?.message}</Field.ErrorText>
              </Field.Root>
              <Field.Root w="10rem" invalid={e?.expiry !== undefined}>
                <Field.Label>Expiry</Field.Label>
                <Input type="date" {...form.register(`items.${i}.expiry`, { setValueAs: nullIfEmpty })} />
                <Field.ErrorText>{e?.expiry?.message}</Field.ErrorText>
              </Field.Root>
              <Controller
                control={form.control}
                name={`items.${i}.controlled`}
                render={({ field: f }) => (
                  <Checkbox.Root checked={f.value === true} onCheckedChange={(d) => f.onChange(d.checked === true)} mb="2">
                    <Checkbox.HiddenInput />
                    <Checkbox.Control />
                    <Checkbox.Label>Controlled</Checkbox.Label>
                  </Checkbox.Root>
                )}
              />
              <Button variant="ghost" colorPalette="red" onClick={() => items.remove(i)} aria-label={`Remove item ${i + 1}`}>
                Remove
              </Button>
            </Flex>
          );
        })}
        {errors.items?.message ? <Text color="fg.error">{errors.items.message}</Text> : null}
        {save.error ? <ErrorMessage title="Not saved" message={save.error.message} /> : null}
        <HStack gap="3">
          <Button variant="outline" onClick={() => items.append(blankItem)}>
            Add a drug
          </Button>
          <Button type="submit" colorPalette="brand" loading={save.isPending}>
            Save tray
          </Button>
          <Button variant="ghost" onClick={onDone}>
            Cancel
          </Button>
        </HStack>
      </Stack>
    </form>
  );
}
