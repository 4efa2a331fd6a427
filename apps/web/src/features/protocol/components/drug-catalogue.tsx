import { Box, Button, Checkbox, Field, Fieldset, Input, Flex, Heading, NativeSelect, SimpleGrid, Stack, Text } from '@chakra-ui/react';
import { DOSE_UNITS, DRUG_ROUTES, type DoseUnit, type DrugDefinition, type ProtocolSettings } from '@steadyhand/shared';
import { useController, useFieldArray, useFormContext, useWatch } from 'react-hook-form';
import { NumberField, TextField, type SettingsPath } from './form-fields';

const UNIT_LABELS: Record<DoseUnit, string> = { mg: 'mg', ug: 'micrograms (mcg)', g: 'g', meq: 'mEq', mL: 'mL' };
const ROUTE_LABELS: Record<(typeof DRUG_ROUTES)[number], string> = { iv: 'IV', io: 'IO', et: 'ET', other: 'Other' };

// Blank numbers, not guesses: the admin types each dose from the protocol (the schema refuses blanks).
const blankRule = () => ({ amount: undefined as unknown as number });
const blankPerKgRule = () => ({ perKg: undefined as unknown as number });

const NEW_DRUG: DrugDefinition = {
  key: '',
  label: '',
  unit: 'mg',
  route: 'iv',
  adult: { doses: [blankRule()], repeatLast: false, maxDoses: 1 },
  concentrations: [],
  cautions: [],
  source: 'Local protocol: name the document and its date.',
};

/**
 * A controlled select: the shown option always comes from the form value (an uncontrolled
 * select could fall back to its first option, silently turning g into mg).
 */
function SelectField({ name, label, options }: { name: SettingsPath; label: string; options: { value: string; label: string }[] }) {
  const {
    field: { ref, name: fieldName, value, onChange, onBlur },
  } = useController<ProtocolSettings>({ name });
  return (
    <Field.Root required>
      <Field.Label>{label}</Field.Label>
      <NativeSelect.Root size="lg">
        <NativeSelect.Field ref={ref} name={fieldName} value={typeof value === 'string' ? value : ''} onChange={onChange} onBlur={onBlur} bg="bg.panel" textStyle="lg">
          {options.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </NativeSelect.Field>
        <NativeSelect.Indicator />
      </NativeSelect.Root>
    </Field.Root>
  );
}

/** Every drug the pads offer, with its doses; keys of saved drugs stay fixed because past entries name them. */
export function DrugCatalogue({ savedKeys }: { savedKeys: ReadonlySet<string> }) {
  const { fields, append, remove } = useFieldArray<ProtocolSettings, 'drugs', 'fieldId'>({ name: 'drugs', keyName: 'fieldId' });
  return (
    <Stack gap="5">
      <Stack as="ol" gap="5" listStyleType="none" m="0" p="0" aria-label="Drugs in the catalogue">
        {fields.map((field, index) => (
          <Box as="li" key={field.fieldId}>
            <DrugCard index={index} keyLocked={savedKeys.has(field.key)} onRemove={fields.length > 1 ? () => remove(index) : undefined} />
          </Box>
        ))}
      </Stack>
      <Box>
        <Button variant="outline" size="lg" onClick={() => append({ ...NEW_DRUG, adult: { ...NEW_DRUG.adult, doses: [blankRule()] } })}>
          Add a drug
        </Button>
      </Box>
    </Stack>
  );
}

function DrugCard({ index, keyLocked, onRemove }: { index: number; keyLocked: boolean; onRemove: (() => void) | undefined }) {
  const label = useWatch<ProtocolSettings, `drugs.${number}.label`>({ name: `drugs.${index}.label` });
  const source = useWatch<ProtocolSettings, `drugs.${number}.source`>({ name: `drugs.${index}.source` });
  const name = label.trim() === '' ? `Drug ${String(index + 1)}` : label;
  return (
    <Fieldset.Root
      borderWidth="1px"
      borderColor="border.emphasized"
      borderLeftWidth="6px"
      borderLeftColor="ink.solid"
      borderRadius="l2"
      p={{ base: '4', md: '5' }}
      bg="bg.panel"
      data-testid={`drug-${String(index)}`}
    >
      <Flex justify="space-between" align="center" gap="4" wrap="wrap">
        <Fieldset.Legend>
          <Heading as="h3" textStyle="xl">
            {name}
          </Heading>
        </Fieldset.Legend>
        {onRemove ? (
          <Button variant="ghost" colorPalette="red" onClick={onRemove} aria-label={`Remove ${name} from the catalogue`}>
            Remove
          </Button>
        ) : null}
      </Flex>
      <Text textStyle="md" color="fg.muted" data-testid={`drug-source-${String(index)}`}>
        <Text as="span" fontWeight="bold">
          Source:{' '}
        </Text>
        {source}
      </Text>
      <Fieldset.Content>
        <SimpleGrid columns={{ base: 1, md: 2, lg: 4 }} gap="4">
          <TextField name={`drugs.${index}.label`} label="Name on the pad" />
          <TextField
            name={`drugs.${index}.key`}
            label="Key"
            readOnly={keyLocked}
            help={keyLocked ? 'Fixed: past entries refer to it.' : 'Short and unique, e.g. "vasopressin".'}
          />
          <SelectField name={`drugs.${index}.unit`} label="Unit" options={DOSE_UNITS.map((u) => ({ value: u, label: UNIT_LABELS[u] }))} />
          <SelectField name={`drugs.${index}.route`} label="Usual route" options={DRUG_ROUTES.map((r) => ({ value: r, label: ROUTE_LABELS[r] }))} />
        </SimpleGrid>
        <DoseScheduleFields drugIndex={index} drugName={name} category="adult" />
        <DoseScheduleFields drugIndex={index} drugName={name} category="pediatric" />
        <Concentrations drugIndex={index} drugName={name} />
        <TextField name={`drugs.${index}.source`} label="Source of these values" multiline help="Guideline, table and year, or your local protocol." />
      </Fieldset.Content>
    </Fieldset.Root>
  );
}

const CATEGORY_WORDS = { adult: 'Adult', pediatric: 'Pediatric' } as const;

/**
 * One category's doses in order, with the limits the pad enforces: how many doses, and the most in
 * total (absolute and per kg). Past a limit the pad asks for a second tap.
 */
function DoseScheduleFields({ drugIndex, drugName, category }: { drugIndex: number; drugName: string; category: 'adult' | 'pediatric' }) {
  const { setValue } = useFormContext<ProtocolSettings>();
  const schedule = useWatch<ProtocolSettings, `drugs.${number}.${typeof category}`>({ name: `drugs.${drugIndex}.${category}` });
  const base = `drugs.${drugIndex}.${category}` as const;
  const words = CATEGORY_WORDS[category];
  if (!schedule) {
    return (
      <Stack gap="2" borderTopWidth="1px" borderColor="border" pt="4">
        <Heading as="h4" textStyle="lg">
          {words} doses
        </Heading>
        <Text color="fg.muted">No {words.toLowerCase()} dose: the pad suggests none{category === 'pediatric' ? ' for a child (never the adult dose)' : ''}.</Text>
        <Box>
          <Button
            variant="outline"
            onClick={() => setValue(base, { doses: [category === 'pediatric' ? blankPerKgRule() : blankRule()], repeatLast: false }, { shouldDirty: true })}
            aria-label={`Add ${words.toLowerCase()} doses for ${drugName}`}
          >
            Add {words.toLowerCase()} doses
          </Button>
        </Box>
      </Stack>
    );
  }
  return (
    <Stack gap="3" borderTopWidth="1px" borderColor="border" pt="4" data-testid={`schedule-${String(drugIndex)}-${category}`}>
      <Flex justify="space-between" align="center" gap="3" wrap="wrap">
        <Heading as="h4" textStyle="lg">
          {words} doses, in order
        </Heading>
        {category === 'pediatric' ? (
          <Button variant="ghost" colorPalette="red" onClick={() => setValue(base, undefined, { shouldDirty: true })} aria-label={`No pediatric dose for ${drugName}: removes its pediatric doses`}>
            No pediatric dose
          </Button>
        ) : null}
      </Flex>
      <DoseRules drugIndex={drugIndex} drugName={drugName} category={category} />
      <SimpleGrid columns={{ base: 1, md: 2, lg: 4 }} gap="4">
        <RepeatLastField name={`${base}.repeatLast`} />
        <NumberField name={`${base}.maxDoses`} label="Most doses in one code" optional />
        <NumberField name={`${base}.maxTotal`} label="Most in total" optional help="In the drug's unit." />
        <NumberField name={`${base}.maxTotalPerKg`} label="Most in total per kg" optional />
      </SimpleGrid>
      <OptionalTextField name={`${base}.timing`} label="Timing in words" help='e.g. "every 3-5 min"' />
    </Stack>
  );
}

function RepeatLastField({ name }: { name: `drugs.${number}.${'adult' | 'pediatric'}.repeatLast` }) {
  const {
    field: { value, onChange },
  } = useController<ProtocolSettings>({ name });
  return (
    <Checkbox.Root checked={value === true} onCheckedChange={(e) => onChange(e.checked === true)} alignSelf="center">
      <Checkbox.HiddenInput />
      <Checkbox.Control />
      <Checkbox.Label>The last dose may be repeated</Checkbox.Label>
    </Checkbox.Root>
  );
}

function OptionalTextField({ name, label, help }: { name: SettingsPath; label: string; help?: string }) {
  const { register } = useFormContext<ProtocolSettings>();
  return (
    <Field.Root>
      <Field.Label>{label} (optional)</Field.Label>
      <Input {...register(name, { setValueAs: (v: unknown) => (v === '' || v === null ? undefined : v) })} autoComplete="off" bg="bg.panel" />
      {help ? <Field.HelperText>{help}</Field.HelperText> : null}
    </Field.Root>
  );
}

function DoseRules({ drugIndex, drugName, category }: { drugIndex: number; drugName: string; category: 'adult' | 'pediatric' }) {
  const { fields, append, remove } = useFieldArray<ProtocolSettings, `drugs.${number}.${typeof category}.doses`, 'fieldId'>({
    name: `drugs.${drugIndex}.${category}.doses`,
    keyName: 'fieldId',
  });
  const base = `drugs.${drugIndex}.${category}.doses` as const;
  return (
    <Stack gap="3">
      {fields.map((field, ruleIndex) => (
        <Box key={field.fieldId} borderWidth="1px" borderColor="border" borderRadius="l2" p="3">
          <Flex justify="space-between" align="center" mb="2">
            <Text fontWeight="bold">Dose {ruleIndex + 1}</Text>
            {fields.length > 1 ? (
              <Button variant="ghost" colorPalette="red" onClick={() => remove(ruleIndex)} aria-label={`Remove ${category} dose ${String(ruleIndex + 1)} of ${drugName}`}>
                Remove
              </Button>
            ) : null}
          </Flex>
          <SimpleGrid columns={{ base: 1, md: 2, lg: 4 }} gap="4">
            <NumberField name={`${base}.${ruleIndex}.amount`} label="Fixed dose" optional help={category === 'adult' ? 'Used when no weight is known.' : undefined} />
            <NumberField name={`${base}.${ruleIndex}.perKg`} label="Per kg" optional />
            <NumberField name={`${base}.${ruleIndex}.perKgHigh`} label="Per kg, upper end of a range" optional />
            <NumberField name={`${base}.${ruleIndex}.maxDose`} label="Largest single dose" optional />
          </SimpleGrid>
        </Box>
      ))}
      <Box>
        <Button variant="outline" onClick={() => append(category === 'pediatric' ? blankPerKgRule() : blankRule())} aria-label={`Add a ${category} dose for ${drugName}`}>
          Add a {category} dose
        </Button>
      </Box>
    </Stack>
  );
}

/** Concentrations as supplied; the first that fits the patient is shown with the volume. */
function Concentrations({ drugIndex, drugName }: { drugIndex: number; drugName: string }) {
  const { fields, append, remove } = useFieldArray<ProtocolSettings, `drugs.${number}.concentrations`, 'fieldId'>({
    name: `drugs.${drugIndex}.concentrations`,
    keyName: 'fieldId',
  });
  const base = `drugs.${drugIndex}.concentrations` as const;
  return (
    <Stack gap="3" borderTopWidth="1px" borderColor="border" pt="4">
      <Heading as="h4" textStyle="lg">
        Concentrations as supplied
      </Heading>
      <Text color="fg.muted">The first that fits the patient is shown with the volume. Check 0.1 vs 1 mg/mL.</Text>
      {fields.map((field, i) => (
        <Box key={field.fieldId} borderWidth="1px" borderColor="border" borderRadius="l2" p="3">
          <Flex justify="space-between" align="center" mb="2">
            <Text fontWeight="bold">Concentration {i + 1}</Text>
            <Button variant="ghost" colorPalette="red" onClick={() => remove(i)} aria-label={`Remove concentration ${String(i + 1)} of ${drugName}`}>
              Remove
            </Button>
          </Flex>
          <SimpleGrid columns={{ base: 1, md: 2, lg: 5 }} gap="4">
            <NumberField name={`${base}.${i}.perMl`} label="Amount per mL" />
            <TextField name={`${base}.${i}.label`} label="As known on the ward" />
            <SelectField
              name={`${base}.${i}.appliesTo`}
              label="For"
              options={[
                { value: 'any', label: 'Every code' },
                { value: 'adult', label: 'Adult codes' },
                { value: 'pediatric', label: 'Pediatric codes' },
              ]}
            />
            <NumberField name={`${base}.${i}.underAgeMonths`} label="Under this age (months)" optional />
            <NumberField name={`${base}.${i}.upToWeightKg`} label="Up to this weight (kg)" optional />
          </SimpleGrid>
        </Box>
      ))}
      <Box>
        <Button variant="outline" onClick={() => append({ perMl: undefined as unknown as number, label: '', appliesTo: 'any' })} aria-label={`Add a concentration for ${drugName}`}>
          Add a concentration
        </Button>
      </Box>
    </Stack>
  );
}
