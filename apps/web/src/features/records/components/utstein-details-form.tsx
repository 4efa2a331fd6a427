import {
  Alert,
  Box,
  Button,
  Checkbox,
  Fieldset,
  Field,
  Heading,
  HStack,
  Input,
  List,
  NativeSelect,
  SimpleGrid,
  Stack,
  Text,
  Wrap,
} from '@chakra-ui/react';
import {
  ARREST_CAUSES,
  ARREST_LOCATIONS,
  DESTINATIONS,
  GLUCOSE_UNITS,
  MONITORING_KINDS,
  SPECIAL_CIRCUMSTANCE_CHOICES,
  STOP_REASONS,
  TREATMENT_LIMITATIONS,
  TWELVE_LEAD_ECG,
  UTSTEIN_FIELD_LABELS,
  UTSTEIN_FIELDS,
  UTSTEIN_VALUE_WORDS,
  WITNESSED_BY,
  YES_NO_UNKNOWN,
  YES_NO_WORDS,
  utsteinFieldsSchema,
  utsteinProblems,
  utsteinValueText,
  type GlucoseUnit,
  type UtsteinAddendum,
  type UtsteinDetails,
  type UtsteinField,
  type UtsteinPatch,
} from '@steadyhand/shared';
import { useState, type ReactNode } from 'react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { formatDateTime, fromLocalDateTimeInput, toLocalDateTimeInput } from '../../../lib/format';
import { useSaveReviewDetails } from '../api/records-api';

/** The form holds text; blank means "not entered". */
interface Draft {
  witnessed: string;
  witnessedBy: string;
  monitored: string;
  monitoring: string[];
  arrestLocation: string;
  teamArrivedAt: string;
  padsOnAt: string;
  cause: string;
  causeNote: string;
  specialCircumstances: string[];
  treatmentLimitation: string;
  mechanicalCpr: string;
  ecpr: string;
  stopReason: string;
  deathPronouncedAt: string;
  deathPronouncedBy: string;
  temperatureControl: string;
  twelveLeadEcg: string;
  handoverSystolicMmHg: string;
  handoverDiastolicMmHg: string;
  handoverSpo2Percent: string;
  glucoseValue: string;
  glucoseUnit: GlucoseUnit;
  destination: string;
}

const num = (v: number | undefined) => (v === undefined ? '' : String(v));

function toDraft(d: UtsteinDetails): Draft {
  return {
    witnessed: d.witnessed ?? '',
    witnessedBy: d.witnessedBy ?? '',
    monitored: d.monitored ?? '',
    monitoring: d.monitoring ?? [],
    arrestLocation: d.arrestLocation ?? '',
    teamArrivedAt: toLocalDateTimeInput(d.teamArrivedAt),
    padsOnAt: toLocalDateTimeInput(d.padsOnAt),
    cause: d.cause ?? '',
    causeNote: d.causeNote ?? '',
    specialCircumstances: d.specialCircumstances ?? [],
    treatmentLimitation: d.treatmentLimitation ?? '',
    mechanicalCpr: d.mechanicalCpr ?? '',
    ecpr: d.ecpr ?? '',
    stopReason: d.stopReason ?? '',
    deathPronouncedAt: toLocalDateTimeInput(d.deathPronouncedAt),
    deathPronouncedBy: d.deathPronouncedBy ?? '',
    temperatureControl: d.temperatureControl ?? '',
    twelveLeadEcg: d.twelveLeadEcg ?? '',
    handoverSystolicMmHg: num(d.handoverSystolicMmHg),
    handoverDiastolicMmHg: num(d.handoverDiastolicMmHg),
    handoverSpo2Percent: num(d.handoverSpo2Percent),
    glucoseValue: num(d.handoverGlucose?.value),
    glucoseUnit: d.handoverGlucose?.unit ?? 'mmol/L',
    destination: d.destination ?? '',
  };
}

/**
 * The details the draft says, as the API takes them, with the errors of what cannot be read.
 * A detail that only belongs with another answer (who witnessed, the kind of monitoring, the
 * cause in words, who pronounced death) is left out when that answer does not call for it.
 */
export function detailsFromDraft(
  draft: Draft,
  existing: UtsteinDetails,
): { details: Record<string, unknown>; errors: Partial<Record<UtsteinField, string>> } {
  const details: Record<string, unknown> = {};
  const errors: Partial<Record<UtsteinField, string>> = {};
  const text = (k: UtsteinField, v: string) => {
    if (v.trim()) details[k] = v.trim();
  };
  const number = (k: UtsteinField, v: string) => {
    if (!v.trim()) return;
    const n = Number(v);
    if (Number.isFinite(n)) details[k] = n;
    else errors[k] = 'Enter a number, or leave it empty';
  };
  const time = (k: UtsteinField, v: string) => {
    if (!v) return;
    const iso = fromLocalDateTimeInput(v);
    if (!iso) {
      errors[k] = 'Enter a date and time, or leave it empty';
      return;
    }
    // Unchanged to the second: keep the stored value as it was written (its offset included).
    const before = existing[k];
    details[k] =
      typeof before === 'string' && Date.parse(before) === Date.parse(iso) ? before : iso;
  };
  text('witnessed', draft.witnessed);
  if (draft.witnessed === 'yes') text('witnessedBy', draft.witnessedBy);
  text('monitored', draft.monitored);
  if (draft.monitored === 'yes' && draft.monitoring.length) details.monitoring = draft.monitoring;
  text('arrestLocation', draft.arrestLocation);
  time('teamArrivedAt', draft.teamArrivedAt);
  time('padsOnAt', draft.padsOnAt);
  text('cause', draft.cause);
  if (draft.cause === 'other') text('causeNote', draft.causeNote);
  if (draft.specialCircumstances.length) details.specialCircumstances = draft.specialCircumstances;
  text('treatmentLimitation', draft.treatmentLimitation);
  text('mechanicalCpr', draft.mechanicalCpr);
  text('ecpr', draft.ecpr);
  text('stopReason', draft.stopReason);
  if (draft.stopReason !== 'rosc') {
    time('deathPronouncedAt', draft.deathPronouncedAt);
    text('deathPronouncedBy', draft.deathPronouncedBy);
  }
  text('temperatureControl', draft.temperatureControl);
  text('twelveLeadEcg', draft.twelveLeadEcg);
  number('handoverSystolicMmHg', draft.handoverSystolicMmHg);
  number('handoverDiastolicMmHg', draft.handoverDiastolicMmHg);
  number('handoverSpo2Percent', draft.handoverSpo2Percent);
  if (draft.glucoseValue.trim()) {
    const n = Number(draft.glucoseValue);
    if (Number.isFinite(n)) details.handoverGlucose = { value: n, unit: draft.glucoseUnit };
    else errors.handoverGlucose = 'Enter a number, or leave it empty';
  }
  text('destination', draft.destination);
  return { details, errors };
}

/** Only the details that changed go to the server (null clears one), so the audit lists real changes. */
export function utsteinPatchOf(before: UtsteinDetails, after: UtsteinDetails): UtsteinPatch {
  const patch: Record<string, unknown> = {};
  for (const k of UTSTEIN_FIELDS) {
    if (JSON.stringify(before[k] ?? null) !== JSON.stringify(after[k] ?? null))
      patch[k] = after[k] ?? null;
  }
  return patch;
}

const YES_NO = YES_NO_UNKNOWN.map((v) => [v, YES_NO_WORDS[v]] as const);
const words = <K extends keyof typeof UTSTEIN_VALUE_WORDS>(field: K, values: readonly string[]) =>
  values.map((v) => [v, (UTSTEIN_VALUE_WORDS[field] as Record<string, string>)[v] ?? v] as const);

function Choice(props: {
  field: UtsteinField;
  value: string;
  options: readonly (readonly [string, string])[];
  onChange: (v: string) => void;
  error?: string;
  help?: string;
}) {
  const id = `utstein-${props.field}`;
  return (
    <Field.Root invalid={props.error !== undefined}>
      <Field.Label htmlFor={id}>{UTSTEIN_FIELD_LABELS[props.field]}</Field.Label>
      <NativeSelect.Root>
        <NativeSelect.Field
          id={id}
          data-testid={id}
          value={props.value}
          onChange={(e) => props.onChange(e.currentTarget.value)}
        >
          <option value="">Not entered</option>
          {props.options.map(([v, w]) => (
            <option key={v} value={v}>
              {w}
            </option>
          ))}
        </NativeSelect.Field>
        <NativeSelect.Indicator />
      </NativeSelect.Root>
      {props.help ? <Field.HelperText>{props.help}</Field.HelperText> : null}
      <Field.ErrorText>{props.error}</Field.ErrorText>
    </Field.Root>
  );
}

function Entry(props: {
  field: UtsteinField;
  value: string;
  onChange: (v: string) => void;
  type?: string;
  error?: string;
  help?: string;
  children?: ReactNode;
  inputMode?: 'numeric' | 'decimal';
}) {
  const id = `utstein-${props.field}`;
  return (
    <Field.Root invalid={props.error !== undefined}>
      <Field.Label htmlFor={id}>{UTSTEIN_FIELD_LABELS[props.field]}</Field.Label>
      <HStack gap="2" w="full">
        <Input
          id={id}
          data-testid={id}
          type={props.type ?? 'text'}
          step={props.type === 'datetime-local' ? 1 : undefined}
          inputMode={props.inputMode}
          value={props.value}
          onChange={(e) => props.onChange(e.currentTarget.value)}
        />
        {props.children}
      </HStack>
      {props.help ? <Field.HelperText>{props.help}</Field.HelperText> : null}
      <Field.ErrorText>{props.error}</Field.ErrorText>
    </Field.Root>
  );
}

function Ticks(props: {
  field: 'monitoring' | 'specialCircumstances';
  values: readonly string[];
  value: string[];
  onChange: (v: string[]) => void;
  alone?: readonly string[];
  error?: string;
}) {
  const wordsOf = UTSTEIN_VALUE_WORDS[props.field] as Record<string, string>;
  const toggle = (v: string, on: boolean) => {
    if (!on) return props.onChange(props.value.filter((x) => x !== v));
    // "None" and "Unknown" stand alone: ticking one clears the rest, ticking another clears them.
    if (props.alone?.includes(v)) return props.onChange([v]);
    return props.onChange([...props.value.filter((x) => !props.alone?.includes(x)), v]);
  };
  return (
    <Fieldset.Root invalid={props.error !== undefined}>
      <Fieldset.Legend fontWeight="medium">{UTSTEIN_FIELD_LABELS[props.field]}</Fieldset.Legend>
      <Wrap gap="5">
        {props.values.map((v) => (
          <Checkbox.Root
            key={v}
            size="lg"
            checked={props.value.includes(v)}
            onCheckedChange={(e) => toggle(v, e.checked === true)}
            data-testid={`utstein-${props.field}-${v}`}
          >
            <Checkbox.HiddenInput />
            <Checkbox.Control />
            <Checkbox.Label>{wordsOf[v] ?? v}</Checkbox.Label>
          </Checkbox.Root>
        ))}
      </Wrap>
      {props.error ? <Fieldset.ErrorText>{props.error}</Fieldset.ErrorText> : null}
    </Fieldset.Root>
  );
}

interface UtsteinDetailsFormProps {
  codeId: string;
  arrestAt: string;
  /** The details as they read now (signed ones with their addenda applied). */
  details: UtsteinDetails;
  addenda: readonly UtsteinAddendum[];
  /** The record carries a signature: a change is kept as an addendum. */
  signed: boolean;
  /** When the quality review was signed off: the details are closed. */
  closedAt: string | null;
  /** Whether this reader may change them now (and why not, when not). */
  editable: boolean;
  readOnlyReason?: string;
}

/**
 * The registry (Utstein) details of the code that are not taps: completed at review by the
 * recorder or the leader, or by the quality reviewer; after the first signature each change is
 * kept as an addendum beside the signed value.
 */
export function UtsteinDetailsForm({
  codeId,
  arrestAt,
  details,
  addenda,
  signed,
  closedAt,
  editable,
  readOnlyReason,
}: UtsteinDetailsFormProps) {
  const save = useSaveReviewDetails(codeId);
  const [draft, setDraft] = useState<Draft>(() => toDraft(details));
  const [dirty, setDirty] = useState(false);
  const [saved, setSaved] = useState(false);
  // Fresh details from the server (a save, someone else's change) replace the form while nothing is being typed.
  const shown = JSON.stringify(details);
  const [base, setBase] = useState(shown);
  if (shown !== base && !dirty) {
    setBase(shown);
    setDraft(toDraft(details));
  }

  const set = <K extends keyof Draft>(k: K, v: Draft[K]) => {
    setDraft((d) => ({ ...d, [k]: v }));
    setDirty(true);
    setSaved(false);
  };
  const { details: next, errors: readErrors } = detailsFromDraft(draft, details);
  const parsed = utsteinFieldsSchema.safeParse(next);
  const errors: Partial<Record<string, string>> = { ...readErrors };
  if (!parsed.success)
    for (const issue of parsed.error.issues) errors[String(issue.path[0])] ??= issue.message;
  if (parsed.success)
    for (const p of utsteinProblems(parsed.data, { arrestAt }))
      errors[p.path.replace(/^utstein\./, '')] ??= p.message;
  const patch = parsed.success ? utsteinPatchOf(details, parsed.data) : {};
  const changed = Object.keys(patch).length > 0;
  const valid = Object.keys(errors).length === 0;

  const submit = () => {
    if (!valid || !changed) return;
    setSaved(false);
    save.mutate(
      { utstein: patch },
      {
        onSuccess: () => {
          setDirty(false);
          setSaved(true);
        },
      },
    );
  };
  const yn = (field: UtsteinField, help?: string) => (
    <Choice
      field={field}
      value={draft[field as keyof Draft] as string}
      options={YES_NO}
      onChange={(v) => set(field as keyof Draft, v as never)}
      error={errors[field]}
      help={help}
    />
  );

  return (
    <Stack
      as="section"
      gap="5"
      aria-labelledby="utstein-heading"
      data-testid="utstein-details"
      data-signed={signed}
    >
      <Stack gap="1">
        <Heading as="h2" id="utstein-heading" textStyle="2xl">
          Registry details
        </Heading>
        <Text color="fg.muted">
          What the registry needs that the taps do not say (Utstein in-hospital template). Each one
          is optional; choose &ldquo;Unknown&rdquo; when it was looked for and is not known.
        </Text>
      </Stack>
      {closedAt ? (
        <Text data-testid="utstein-closed">
          The quality review was signed off on {formatDateTime(closedAt)}: these details are closed.
        </Text>
      ) : signed && editable ? (
        <Alert.Root status="info" variant="outline">
          <Alert.Indicator />
          <Alert.Title>
            The record is signed: a change is kept as an addendum, beside the signed value, with
            your name and the time.
          </Alert.Title>
        </Alert.Root>
      ) : !editable && readOnlyReason ? (
        <Text color="fg.muted">{readOnlyReason}</Text>
      ) : null}

      <fieldset disabled={!editable}>
        <Stack gap="6">
          <Stack gap="4">
            <Heading as="h3" textStyle="lg">
              The arrest
            </Heading>
            <SimpleGrid columns={{ base: 1, md: 2 }} gap="4">
              {yn('witnessed')}
              {draft.witnessed === 'yes' ? (
                <Choice
                  field="witnessedBy"
                  value={draft.witnessedBy}
                  options={words('witnessedBy', WITNESSED_BY)}
                  onChange={(v) => set('witnessedBy', v)}
                  error={errors.witnessedBy}
                />
              ) : (
                <Box />
              )}
              {yn('monitored', 'Monitored when the arrest happened.')}
              {draft.monitored === 'yes' ? (
                <Ticks
                  field="monitoring"
                  values={MONITORING_KINDS}
                  value={draft.monitoring}
                  onChange={(v) => set('monitoring', v)}
                  error={errors.monitoring}
                />
              ) : (
                <Box />
              )}
              <Choice
                field="arrestLocation"
                value={draft.arrestLocation}
                options={words('arrestLocation', ARREST_LOCATIONS)}
                onChange={(v) => set('arrestLocation', v)}
                error={errors.arrestLocation}
              />
              <Box />
              <Entry
                field="teamArrivedAt"
                type="datetime-local"
                value={draft.teamArrivedAt}
                onChange={(v) => set('teamArrivedAt', v)}
                error={errors.teamArrivedAt}
                help="Your local time. Before the arrest if the team was there first."
              />
              <Entry
                field="padsOnAt"
                type="datetime-local"
                value={draft.padsOnAt}
                onChange={(v) => set('padsOnAt', v)}
                error={errors.padsOnAt}
                help="Your local time. Before the arrest if the pads were already on."
              />
            </SimpleGrid>
          </Stack>

          <Stack gap="4">
            <Heading as="h3" textStyle="lg">
              Cause and circumstances
            </Heading>
            <SimpleGrid columns={{ base: 1, md: 2 }} gap="4">
              <Choice
                field="cause"
                value={draft.cause}
                options={words('cause', ARREST_CAUSES)}
                onChange={(v) => set('cause', v)}
                error={errors.cause}
                help="The reversible causes (4 Hs and 4 Ts), as far as known."
              />
              {draft.cause === 'other' ? (
                <Entry
                  field="causeNote"
                  value={draft.causeNote}
                  onChange={(v) => set('causeNote', v)}
                  error={errors.causeNote}
                />
              ) : (
                <Box />
              )}
              <Ticks
                field="specialCircumstances"
                values={SPECIAL_CIRCUMSTANCE_CHOICES}
                value={draft.specialCircumstances}
                onChange={(v) => set('specialCircumstances', v)}
                alone={['none', 'unknown']}
                error={errors.specialCircumstances}
              />
              <Choice
                field="treatmentLimitation"
                value={draft.treatmentLimitation}
                options={words('treatmentLimitation', TREATMENT_LIMITATIONS)}
                onChange={(v) => set('treatmentLimitation', v)}
                error={errors.treatmentLimitation}
              />
            </SimpleGrid>
          </Stack>

          <Stack gap="4">
            <Heading as="h3" textStyle="lg">
              Resuscitation
            </Heading>
            <SimpleGrid columns={{ base: 1, md: 2 }} gap="4">
              {yn('mechanicalCpr')}
              {yn('ecpr')}
              <Choice
                field="stopReason"
                value={draft.stopReason}
                options={words('stopReason', STOP_REASONS)}
                onChange={(v) => set('stopReason', v)}
                error={errors.stopReason}
              />
              <Box />
              {draft.stopReason !== 'rosc' ? (
                <>
                  <Entry
                    field="deathPronouncedAt"
                    type="datetime-local"
                    value={draft.deathPronouncedAt}
                    onChange={(v) => set('deathPronouncedAt', v)}
                    error={errors.deathPronouncedAt}
                    help="Your local time."
                  />
                  <Entry
                    field="deathPronouncedBy"
                    value={draft.deathPronouncedBy}
                    onChange={(v) => set('deathPronouncedBy', v)}
                    error={errors.deathPronouncedBy}
                  />
                </>
              ) : null}
            </SimpleGrid>
          </Stack>

          <Stack gap="4">
            <Heading as="h3" textStyle="lg">
              After ROSC
            </Heading>
            <SimpleGrid columns={{ base: 1, md: 2 }} gap="4">
              {yn('temperatureControl')}
              <Choice
                field="twelveLeadEcg"
                value={draft.twelveLeadEcg}
                options={words('twelveLeadEcg', TWELVE_LEAD_ECG)}
                onChange={(v) => set('twelveLeadEcg', v)}
                error={errors.twelveLeadEcg}
              />
              <Entry
                field="handoverSystolicMmHg"
                inputMode="numeric"
                value={draft.handoverSystolicMmHg}
                onChange={(v) => set('handoverSystolicMmHg', v)}
                error={errors.handoverSystolicMmHg}
              />
              <Entry
                field="handoverDiastolicMmHg"
                inputMode="numeric"
                value={draft.handoverDiastolicMmHg}
                onChange={(v) => set('handoverDiastolicMmHg', v)}
                error={errors.handoverDiastolicMmHg}
              />
              <Entry
                field="handoverSpo2Percent"
                inputMode="numeric"
                value={draft.handoverSpo2Percent}
                onChange={(v) => set('handoverSpo2Percent', v)}
                error={errors.handoverSpo2Percent}
              />
              <Entry
                field="handoverGlucose"
                inputMode="decimal"
                value={draft.glucoseValue}
                onChange={(v) => set('glucoseValue', v)}
                error={errors.handoverGlucose}
              >
                <NativeSelect.Root maxW="9rem">
                  <NativeSelect.Field
                    aria-label="Glucose unit"
                    data-testid="utstein-glucose-unit"
                    value={draft.glucoseUnit}
                    onChange={(e) => set('glucoseUnit', e.currentTarget.value as GlucoseUnit)}
                  >
                    {GLUCOSE_UNITS.map((u) => (
                      <option key={u} value={u}>
                        {u}
                      </option>
                    ))}
                  </NativeSelect.Field>
                  <NativeSelect.Indicator />
                </NativeSelect.Root>
              </Entry>
              <Choice
                field="destination"
                value={draft.destination}
                options={words('destination', DESTINATIONS)}
                onChange={(v) => set('destination', v)}
                error={errors.destination}
              />
            </SimpleGrid>
          </Stack>
        </Stack>
      </fieldset>

      {editable ? (
        <HStack gap="3">
          <Button
            colorPalette="brand"
            size="lg"
            onClick={submit}
            loading={save.isPending}
            loadingText="Saving…"
            disabled={!changed || !valid}
            data-testid="utstein-save"
          >
            {signed ? 'Save as an addendum' : 'Save the registry details'}
          </Button>
          {saved && !dirty ? <Text role="status">Saved.</Text> : null}
          {!valid ? <Text color="fg.error">Correct the fields marked above.</Text> : null}
        </HStack>
      ) : null}
      {save.error ? <ErrorMessage title="Not saved" message={save.error.message} /> : null}

      {addenda.length > 0 ? (
        <Stack gap="2" data-testid="utstein-addenda">
          <Heading as="h3" textStyle="lg">
            Changed after signing
          </Heading>
          <List.Root gap="1" ps="5">
            {addenda.flatMap((a) =>
              Object.entries(a.changes).map(([field, change]) => {
                const f = field as UtsteinField;
                const read = (v: unknown) =>
                  v === null || v === undefined
                    ? 'not entered'
                    : typeof v === 'string' &&
                        ['teamArrivedAt', 'padsOnAt', 'deathPronouncedAt'].includes(f)
                      ? formatDateTime(v)
                      : (utsteinValueText(f, { [f]: v }) ?? '');
                return (
                  <List.Item key={`${a.id}-${field}`}>
                    {UTSTEIN_FIELD_LABELS[f]}: {read(change.to)} (was {read(change.from)});{' '}
                    {a.userName}, {formatDateTime(a.recordedAt)}
                  </List.Item>
                );
              }),
            )}
          </List.Root>
        </Stack>
      ) : null}
    </Stack>
  );
}
