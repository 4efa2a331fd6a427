import { Box, Button, Field, Fieldset, Flex, Heading, NativeSelect, SimpleGrid, Stack, Text } from '@chakra-ui/react';
import { DOSE_UNITS, DRUG_ROUTES, type DoseUnit, type DrugDefinition, type ProtocolSettings } from '@steadyhand/shared';
import { useController, useFieldArray, useWatch } from 'react-hook-form';
import { NumberField, NumberListField, TextField, type SettingsPath } from './form-fields';

const UNIT_LABELS: Record<DoseUnit, string> = { mg: 'mg', ug: 'micrograms (mcg)', g: 'g', meq: 'mEq', mL: 'mL' };
const ROUTE_LABELS: Record<(typeof DRUG_ROUTES)[number], string> = { iv: 'IV', io: 'IO', et: 'ET', other: 'Other' };

const NEW_DRUG: DrugDefinition = {
  key: '',
  label: '',
  unit: 'mg',
  route: 'iv',
  adultDoses: [],
  pediatric: [],
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
        <Button variant="outline" size="lg" onClick={() => append({ ...NEW_DRUG, pediatric: [] })}>
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
        <SimpleGrid columns={{ base: 1, md: 2 }} gap="4">
          <NumberListField
            name={`drugs.${index}.adultDoses`}
            label="Adult doses in order"
            help="Dose 1, dose 2…, separated by commas; the last one repeats."
          />
          <NumberField
            name={`drugs.${index}.concentrationPerMl`}
            label="Concentration as supplied, per mL"
            optional
            help="Amount per mL, so the pad can show the volume. Check 0.1 vs 1 mg/mL."
          />
        </SimpleGrid>
        <PediatricRules drugIndex={index} drugName={name} />
        <TextField name={`drugs.${index}.source`} label="Source of these values" multiline help="Guideline, table and year, or your local protocol." />
      </Fieldset.Content>
    </Fieldset.Root>
  );
}

// Blank, not a guess: the admin must type the dose from the protocol (the schema refuses it empty).
const blankRule = () => ({ perKg: undefined as unknown as number });

/** Pediatric doses per kg, in order, each with its largest single dose. */
function PediatricRules({ drugIndex, drugName }: { drugIndex: number; drugName: string }) {
  const { fields, append, remove } = useFieldArray<ProtocolSettings, `drugs.${number}.pediatric`, 'fieldId'>({
    name: `drugs.${drugIndex}.pediatric`,
    keyName: 'fieldId',
  });
  return (
    <Stack gap="3" borderTopWidth="1px" borderColor="border" pt="4">
      <Heading as="h4" textStyle="lg">
        Pediatric doses per kg
      </Heading>
      {fields.length === 0 ? (
        <Text color="fg.muted">No pediatric dose: the pad suggests none for a child.</Text>
      ) : (
        fields.map((field, ruleIndex) => (
          <Box key={field.fieldId} borderWidth="1px" borderColor="border" borderRadius="l2" p="3">
            <Flex justify="space-between" align="center" mb="2">
              <Text fontWeight="bold">Dose {ruleIndex + 1}{ruleIndex === fields.length - 1 ? ' (repeats)' : ''}</Text>
              <Button variant="ghost" colorPalette="red" onClick={() => remove(ruleIndex)} aria-label={`Remove pediatric dose ${String(ruleIndex + 1)} of ${drugName}`}>
                Remove
              </Button>
            </Flex>
            <SimpleGrid columns={{ base: 1, md: 3 }} gap="4">
              <NumberField name={`drugs.${drugIndex}.pediatric.${ruleIndex}.perKg`} label="Per kg" />
              <NumberField name={`drugs.${drugIndex}.pediatric.${ruleIndex}.perKgHigh`} label="Per kg, upper end of a range" optional />
              <NumberField name={`drugs.${drugIndex}.pediatric.${ruleIndex}.maxDose`} label="Largest single dose" optional />
            </SimpleGrid>
          </Box>
        ))
      )}
      <Box>
        <Button variant="outline" onClick={() => append(blankRule())} aria-label={`Add a pediatric dose for ${drugName}`}>
          Add a pediatric dose
        </Button>
      </Box>
    </Stack>
  );
}
