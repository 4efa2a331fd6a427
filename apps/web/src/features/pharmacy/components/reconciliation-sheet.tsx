import { Alert, Badge, Box, Button, Field, Flex, Heading, HStack, Input, NativeSelect, Stack, Table, Text, Textarea, Wrap } from '@chakra-ui/react';
import { zodResolver } from '@hookform/resolvers/zod';
import {
  DISCREPANCY_WORDS,
  formatAmount,
  reconcileDrugs,
  reconciliationCounts,
  UNIT_WORDS,
  type ProtocolSettings,
  type ReconciledDrug,
  type ReconciliationLineInput,
  type ReconciliationView,
  textSchema,
} from '@steadyhand/shared';
import { useMemo, useState, type ReactNode } from 'react';
import { useForm, useWatch, type UseFormRegister } from 'react-hook-form';
import { z } from 'zod';
import { ErrorMessage } from '../../../components/ui/error-message';
import { restockHref, useSaveReconciliation } from '../api/pharmacy-api';
import { AddendumForm } from './addendum-form';
import { DiscrepancyList } from './discrepancy-badge';
import { ExpiryBadge } from './expiry-badge';
import { SignOffDialog } from './sign-off-dialog';

const count = z.number({ error: 'enter a number' }).int('whole units').min(0, 'not below 0').max(500);
const lineSchema = z
  .object({
    drugKey: textSchema(),
    unitsOpened: count,
    unitsWasted: count,
    wasteWitness: textSchema().max(120),
    lotNumbers: textSchema().max(200),
  })
  .refine((l) => l.unitsWasted <= l.unitsOpened, { message: 'more wasted than opened', path: ['unitsWasted'] });
const sheetSchema = z.object({ notes: textSchema().max(4000), trayId: textSchema(), lines: z.array(lineSchema) });
type SheetValues = z.infer<typeof sheetSchema>;

const nullIfBlank = (s: string) => (s.trim() === '' ? null : s.trim());

export function toLines(values: SheetValues['lines']): ReconciliationLineInput[] {
  return values.map((l) => ({
    drugKey: l.drugKey,
    trayItemId: null,
    unitsOpened: Number.isFinite(l.unitsOpened) ? l.unitsOpened : 0,
    unitsWasted: Number.isFinite(l.unitsWasted) ? l.unitsWasted : 0,
    wasteWitness: nullIfBlank(l.wasteWitness),
    lotNumbers: nullIfBlank(l.lotNumbers),
    note: null,
  }));
}

/** The record's totals back in summary shape, so the page runs the same rules as the server. */
function totalsOf(view: ReconciliationView) {
  return view.rows.flatMap((r) => r.recorded.map((t) => ({ drug: r.drugKey, label: r.label, unit: t.unit, total: t.total, doses: t.doses })));
}

const when = (iso: string | null) => (iso ? new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone: 'UTC' }) + ' UTC' : 'not recorded');

function givenWords(row: ReconciledDrug): string {
  if (row.doses === 0) return 'None recorded';
  const recorded = row.recorded.map((t) => `${formatAmount(t.total)} ${UNIT_WORDS[t.unit]}`).join(' + ');
  const converted =
    row.given !== null && row.unit && (row.recorded.length > 1 || row.recorded[0]?.unit !== row.unit)
      ? ` = ${formatAmount(row.given)} ${UNIT_WORDS[row.unit]}`
      : '';
  return `${recorded}${converted} in ${row.doses} dose${row.doses === 1 ? '' : 's'}`;
}

export function ReconciliationSheet({ view, settings }: { view: ReconciliationView; settings: ProtocolSettings | undefined }) {
  const signed = view.status === 'signed';
  return (
    <Stack gap="6">
      <CodeHeader view={view} />
      {signed ? <SignedSheet view={view} /> : <DraftSheet view={view} settings={settings} />}
    </Stack>
  );
}

function CodeHeader({ view }: { view: ReconciliationView }) {
  const { code } = view;
  return (
    <Stack gap="2">
      <Wrap gap="3" align="center">
        <Badge size="lg" colorPalette={view.status === 'signed' ? 'green' : 'gray'} variant="solid" data-testid="reconciliation-status">
          {view.status === 'signed' ? '✓ Signed off' : view.status === 'draft' ? 'Draft' : 'Not started'}
        </Badge>
        {code.recordSigned ? (
          <Badge size="lg" colorPalette="brand" variant="subtle">
            Record signed
          </Badge>
        ) : (
          <Badge size="lg" colorPalette="orange" variant="outline" data-testid="record-not-signed">
            ● Record not yet signed
          </Badge>
        )}
        <Badge size="lg" colorPalette={view.counts.discrepancies > 0 ? 'red' : 'green'} variant="subtle">
          {view.counts.discrepancies > 0 ? `▲ ${view.counts.discrepancies} with discrepancies` : '✓ No discrepancies'}
        </Badge>
      </Wrap>
      <Text textStyle="lg">
        {code.unitName ?? code.location ?? 'Location not recorded'} · arrest {when(code.arrestAt)} · ended {when(code.endedAt)}
      </Text>
      <Text color="fg.muted">Tray: {view.tray?.name ?? 'none chosen'}</Text>
    </Stack>
  );
}

function RestockLinks({ codeId }: { codeId: string }) {
  return (
    <HStack gap="4" wrap="wrap">
      <Button asChild variant="outline" size="lg">
        <a href={restockHref(codeId, 'pdf')} target="_blank" rel="noreferrer" data-testid="restock-pdf">
          Restock list (PDF, to print)
        </a>
      </Button>
      <Button asChild variant="outline" size="lg">
        <a href={restockHref(codeId, 'csv')} download data-testid="restock-csv">
          Restock list (CSV)
        </a>
      </Button>
    </HStack>
  );
}

function DraftSheet({ view, settings }: { view: ReconciliationView; settings: ProtocolSettings | undefined }) {
  const save = useSaveReconciliation(view.code.id);
  const [signing, setSigning] = useState(false);
  const defaults: SheetValues = useMemo(
    () => ({
      notes: view.notes ?? '',
      trayId: view.tray?.id ?? '',
      lines: view.rows.map((r) => {
        const line = view.lines.find((l) => l.drugKey === r.drugKey);
        return { drugKey: r.drugKey, unitsOpened: line?.unitsOpened ?? 0, unitsWasted: line?.unitsWasted ?? 0, wasteWitness: line?.wasteWitness ?? '', lotNumbers: line?.lotNumbers ?? '' };
      }),
    }),
    [view],
  );
  const form = useForm<SheetValues>({ resolver: zodResolver(sheetSchema), defaultValues: defaults, values: defaults });
  const lines = useWatch({ control: form.control, name: 'lines' });
  // The same rules as the server, live while the pharmacist types.
  const live = useMemo(
    () => reconcileDrugs({ drugTotals: totalsOf(view), items: view.items, lines: toLines(lines), settings }),
    [view, lines, settings],
  );
  const liveByKey = new Map(live.map((r) => [r.drugKey, r]));
  const counts = reconciliationCounts(live);
  const request = (values: SheetValues) => ({ notes: nullIfBlank(values.notes), lines: toLines(values.lines), ...(values.trayId ? { trayId: values.trayId } : {}) });
  const onSave = form.handleSubmit((values) => save.mutate(request(values)));
  const onSignOff = form.handleSubmit(async (values) => {
    await save.mutateAsync(request(values));
    setSigning(true);
  });
  const trayChanged = useWatch({ control: form.control, name: 'trayId' }) !== (view.tray?.id ?? '');

  return (
    <form onSubmit={(e) => void onSave(e)} noValidate>
      <Stack gap="5">
        {!view.tray || view.trays.length > 1 ? (
          <Field.Root maxW="28rem">
            <Field.Label>Tray on this cart</Field.Label>
            <NativeSelect.Root>
              <NativeSelect.Field {...form.register('trayId')} data-testid="tray-select">
                <option value="">Choose a tray</option>
                {view.trays.map((t) => (
                  <option key={t.id} value={t.id}>
                    {t.name}
                  </option>
                ))}
              </NativeSelect.Field>
              <NativeSelect.Indicator />
            </NativeSelect.Root>
            {trayChanged ? <Field.HelperText>Save to compare against this tray.</Field.HelperText> : null}
          </Field.Root>
        ) : null}
        <Alert.Root status={counts.discrepancies > 0 ? 'error' : 'success'} variant="outline" borderWidth="2px" data-testid="live-summary">
          <Alert.Indicator />
          <Alert.Title textStyle="lg">
            {counts.discrepancies > 0
              ? `${counts.discrepancies} drug${counts.discrepancies === 1 ? '' : 's'} with a discrepancy: resolve or explain before signing off.`
              : 'Every drug given is accounted for.'}
          </Alert.Title>
        </Alert.Root>
        <ReconciliationTable rows={defaults.lines.flatMap((line) => liveByKey.get(line.drugKey) ?? [])}>
          {(row) => {
            const index = defaults.lines.findIndex((l) => l.drugKey === row.drugKey);
            const error = form.formState.errors.lines?.[index];
            const errors = { unitsOpened: error?.unitsOpened?.message, unitsWasted: error?.unitsWasted?.message };
            return <DrugRow key={row.drugKey} row={row} index={index} register={form.register} errors={errors} />;
          }}
        </ReconciliationTable>
        <Field.Root>
          <Field.Label>Notes</Field.Label>
          <Textarea {...form.register('notes')} rows={3} placeholder="Where a discrepancy came from, who was told, what was done" />
        </Field.Root>
        {save.error ? <ErrorMessage title="Not saved" message={save.error.message} /> : null}
        <Flex gap="3" wrap="wrap" align="center">
          <Button type="submit" size="lg" variant="outline" loading={save.isPending} loadingText="Saving…" data-testid="save-reconciliation">
            Save draft
          </Button>
          <Button size="lg" colorPalette="brand" onClick={() => void onSignOff()} loading={save.isPending} data-testid="open-sign-off">
            Sign off…
          </Button>
          {save.isSuccess && !form.formState.isDirty ? <Text color="fg.muted">Saved.</Text> : null}
        </Flex>
        <RestockLinks codeId={view.code.id} />
      </Stack>
      <SignOffDialog open={signing} onClose={() => setSigning(false)} view={view} counts={counts} />
    </form>
  );
}

interface DrugRowProps {
  row: ReconciledDrug;
  index: number;
  register: UseFormRegister<SheetValues>;
  errors: { unitsOpened?: string | undefined; unitsWasted?: string | undefined };
}

/** Problems worth an explanation: anything but "balanced" (which needs no words). */
const explained = (row: ReconciledDrug) => row.discrepancies.filter((d) => d.kind !== 'balanced');

/**
 * One compact row per drug: given, opened, wasted, witness, lots, status. The explanation goes on
 * a line under the row only when something does not balance.
 */
function ReconciliationTable({ rows, children }: { rows: ReconciledDrug[]; children: (row: ReconciledDrug, index: number) => ReactNode }) {
  return (
    <Table.ScrollArea whiteSpace="normal" borderWidth="1px" borderRadius="l2">
      <Table.Root size="sm" data-testid="reconciliation-table" css={{ '& td, & th': { verticalAlign: 'top', overflowWrap: 'anywhere' } }}>
        <Table.Header>
          <Table.Row>
            <Table.ColumnHeader>Drug</Table.ColumnHeader>
            <Table.ColumnHeader>Given (record)</Table.ColumnHeader>
            <Table.ColumnHeader w="6rem">Opened</Table.ColumnHeader>
            <Table.ColumnHeader w="6rem">Wasted</Table.ColumnHeader>
            <Table.ColumnHeader>Waste witness</Table.ColumnHeader>
            <Table.ColumnHeader>Lots</Table.ColumnHeader>
            <Table.ColumnHeader>Status</Table.ColumnHeader>
          </Table.Row>
        </Table.Header>
        {rows.map((row, i) => children(row, i))}
      </Table.Root>
    </Table.ScrollArea>
  );
}

/** The drug's own cell: name, controlled, strength and what the tray holds, its lot. */
function DrugCell({ row, flagColor }: { row: ReconciledDrug; flagColor: string }) {
  return (
    <Table.Cell borderLeftWidth="6px" borderLeftColor={flagColor}>
      <HStack gap="2" wrap="wrap">
        <Heading as="h3" textStyle="md">
          {row.label}
        </Heading>
        {row.controlled ? (
          <Badge colorPalette="purple" variant="solid">
            Controlled
          </Badge>
        ) : null}
      </HStack>
      <Text color="fg.muted" textStyle="sm">
        {row.strength ? `${row.strength} · tray holds ${row.par ?? 0}` : 'Not on this tray'}
      </Text>
      <TrayLot row={row} />
    </Table.Cell>
  );
}

/** The line under a drug that does not balance: what is wrong, in words. */
function ExplanationRow({ row }: { row: ReconciledDrug }) {
  const problems = explained(row);
  if (problems.length === 0) return null;
  return (
    <Table.Row data-testid={`explanation-${row.drugKey}`}>
      <Table.Cell colSpan={7} pt="0" borderLeftWidth="6px" borderLeftColor="red.solid">
        <Stack gap="0.5">
          {problems.map((d) => (
            <Text key={d.kind} textStyle="sm">
              <strong>{DISCREPANCY_WORDS[d.kind]}:</strong> {d.message}
            </Text>
          ))}
        </Stack>
      </Table.Cell>
    </Table.Row>
  );
}

function DrugRow({ row, index, register, errors }: DrugRowProps) {
  const label = row.label;
  const flaggedLeft = row.flagged ? 'red.solid' : row.touched ? 'green.solid' : 'border';
  return (
    <Table.Body data-testid={`drug-row-${row.drugKey}`} data-flagged={row.flagged} aria-label={label}>
      <Table.Row>
        <DrugCell row={row} flagColor={flaggedLeft} />
        <Table.Cell data-testid={`given-${row.drugKey}`}>{givenWords(row)}</Table.Cell>
        <Table.Cell>
          <Field.Root invalid={errors.unitsOpened !== undefined}>
            <Input size="sm" type="number" inputMode="numeric" min={0} aria-label={`${label}: units opened`} {...register(`lines.${index}.unitsOpened`, { valueAsNumber: true })} />
            <Field.ErrorText>{errors.unitsOpened}</Field.ErrorText>
          </Field.Root>
        </Table.Cell>
        <Table.Cell>
          <Field.Root invalid={errors.unitsWasted !== undefined}>
            <Input size="sm" type="number" inputMode="numeric" min={0} aria-label={`${label}: units wasted`} {...register(`lines.${index}.unitsWasted`, { valueAsNumber: true })} />
            <Field.ErrorText>{errors.unitsWasted}</Field.ErrorText>
          </Field.Root>
        </Table.Cell>
        <Table.Cell>
          <Input size="sm" aria-label={`${label}: waste witness${row.controlled ? ' (required)' : ''}`} placeholder={row.controlled ? 'required' : undefined} {...register(`lines.${index}.wasteWitness`)} autoComplete="off" />
        </Table.Cell>
        <Table.Cell>
          <Input size="sm" aria-label={`${label}: lot numbers`} {...register(`lines.${index}.lotNumbers`)} autoComplete="off" />
        </Table.Cell>
        <Table.Cell>
          <DiscrepancyList discrepancies={row.discrepancies} testId={`discrepancies-${row.drugKey}`} compact />
        </Table.Cell>
      </Table.Row>
      <ExplanationRow row={row} />
    </Table.Body>
  );
}

/** The lot and expiry on the tray now, flagged when expired or expiring within 30 days. */
function TrayLot({ row }: { row: ReconciledDrug }) {
  if (!row.trayLot && !row.trayExpiry) return null;
  return (
    <HStack gap="2" wrap="wrap" data-testid={`tray-lot-${row.drugKey}`}>
      <Text color="fg.muted" textStyle="sm">
        On the tray: {row.trayLot ? `lot ${row.trayLot}` : 'lot not recorded'}
        {row.trayExpiry ? ` · expiry ${row.trayExpiry}` : ''}
      </Text>
      <ExpiryBadge expiry={row.trayExpiry} />
    </HStack>
  );
}

function SignedSheet({ view }: { view: ReconciliationView }) {
  return (
    <Stack gap="5">
      <Alert.Root status="success" variant="outline" borderWidth="2px" data-testid="signed-banner">
        <Alert.Indicator />
        <Alert.Content>
          <Alert.Title textStyle="lg">
            Signed off by {view.signedBy ?? 'a pharmacist'} on {when(view.signedAt)}
          </Alert.Title>
          <Alert.Description>
            Changes from now on go in as addenda.
            {view.mail ? ` Discrepancy e-mail to ${view.mail.to}: ${view.mail.status} (${when(view.mail.sentAt)}).` : ''}
          </Alert.Description>
        </Alert.Content>
      </Alert.Root>
      {view.recordChanged ? (
        <ErrorMessage title="The record changed after sign-off" message="The drug totals in the record no longer match what was signed: check the record's addenda and add an addendum here." />
      ) : null}
      <ReconciliationTable rows={view.rows}>
        {(row) => (
          <Table.Body key={row.drugKey} data-testid={`drug-row-${row.drugKey}`} data-flagged={row.flagged} aria-label={row.label}>
            <Table.Row>
              <DrugCell row={row} flagColor={row.flagged ? 'red.solid' : 'green.solid'} />
              <Table.Cell data-testid={`given-${row.drugKey}`}>{givenWords(row)}</Table.Cell>
              <Table.Cell>{row.unitsOpened}</Table.Cell>
              <Table.Cell>{row.unitsWasted}</Table.Cell>
              <Table.Cell>{row.wasteWitness ?? '—'}</Table.Cell>
              <Table.Cell>{row.lotNumbers ?? '—'}</Table.Cell>
              <Table.Cell>
                <DiscrepancyList discrepancies={row.discrepancies} testId={`discrepancies-${row.drugKey}`} compact />
              </Table.Cell>
            </Table.Row>
            <ExplanationRow row={row} />
          </Table.Body>
        )}
      </ReconciliationTable>
      {view.notes ? (
        <Box>
          <Heading as="h3" textStyle="md">
            Notes
          </Heading>
          <Text whiteSpace="pre-wrap">{view.notes}</Text>
        </Box>
      ) : null}
      <Stack gap="2">
        <Heading as="h2" textStyle="xl">
          Addenda
        </Heading>
        {view.addenda.length === 0 ? <Text color="fg.muted">None.</Text> : null}
        {view.addenda.map((a) => (
          <Box key={a.id} borderWidth="1px" borderRadius="l2" p="3" data-testid="addendum">
            <Text fontWeight="bold">
              {when(a.at)} · {a.by}
            </Text>
            <Text whiteSpace="pre-wrap">{a.text}</Text>
            {a.lines.map((l) => (
              <Text key={l.drugKey} textStyle="sm">
                {l.drugKey}: opened {l.unitsOpened}, wasted {l.unitsWasted}
              </Text>
            ))}
          </Box>
        ))}
      </Stack>
      <AddendumForm view={view} />
      <RestockLinks codeId={view.code.id} />
    </Stack>
  );
}
