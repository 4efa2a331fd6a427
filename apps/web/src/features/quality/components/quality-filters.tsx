import { Button, Field, Input, NativeSelect, SimpleGrid } from '@chakra-ui/react';
import { END_OUTCOME_CHOICES, QUALITY_TARGET_IDS, RHYTHMS, type QualityUnit } from '@steadyhand/shared';
import type { QualityListParams } from '../api/get-quality-codes';
import { OUTCOME_WORDS, RHYTHM_WORDS, TARGET_WORDS } from './words';

interface Props {
  params: QualityListParams;
  units: QualityUnit[];
  onChange: (changes: QualityListParams) => void;
  onClear: () => void;
}

function Choice({ label, name, value, options, onChange }: { label: string; name: string; value: string | undefined; options: [string, string][]; onChange: (v: string) => void }) {
  return (
    <Field.Root>
      <Field.Label htmlFor={`quality-filter-${name}`}>{label}</Field.Label>
      <NativeSelect.Root size="lg">
        <NativeSelect.Field id={`quality-filter-${name}`} data-testid={`quality-filter-${name}`} value={value ?? ''} onChange={(e) => onChange(e.currentTarget.value)}>
          <option value="">All</option>
          {options.map(([v, words]) => (
            <option key={v} value={v}>
              {words}
            </option>
          ))}
        </NativeSelect.Field>
        <NativeSelect.Indicator />
      </NativeSelect.Root>
    </Field.Root>
  );
}

/** The list's filters; each change goes to the URL, so a filtered view can be bookmarked and shared. */
export function QualityFilters({ params, units, onChange, onClear }: Props) {
  return (
    <SimpleGrid as="form" role="search" aria-label="Filter codes" columns={{ base: 1, sm: 2, lg: 4, xl: 7 }} gap="4" alignItems="end" onSubmit={(e) => e.preventDefault()}>
      <Field.Root>
        <Field.Label htmlFor="quality-filter-from">From</Field.Label>
        <Input id="quality-filter-from" type="date" size="lg" value={params.from ?? ''} onChange={(e) => onChange({ from: e.currentTarget.value })} />
      </Field.Root>
      <Field.Root>
        <Field.Label htmlFor="quality-filter-to">To</Field.Label>
        <Input id="quality-filter-to" type="date" size="lg" value={params.to ?? ''} onChange={(e) => onChange({ to: e.currentTarget.value })} />
      </Field.Root>
      <Choice label="Unit" name="unit" value={params.unitId} options={units.map((u) => [u.id, u.name])} onChange={(v) => onChange({ unitId: v })} />
      <Choice
        label="First rhythm"
        name="rhythm"
        value={params.firstRhythm}
        options={[...RHYTHMS.map((r): [string, string] => [r, RHYTHM_WORDS[r]]), ['none', 'None recorded']]}
        onChange={(v) => onChange({ firstRhythm: v })}
      />
      <Choice label="Outcome" name="outcome" value={params.outcome} options={END_OUTCOME_CHOICES.map((o) => [o, OUTCOME_WORDS[o]])} onChange={(v) => onChange({ outcome: v })} />
      <Choice
        label="Target missed"
        name="missed"
        value={params.missed}
        options={[['any', 'Any target'], ...QUALITY_TARGET_IDS.map((t): [string, string] => [t, TARGET_WORDS[t]])]}
        onChange={(v) => onChange({ missed: v })}
      />
      <Button variant="outline" size="lg" onClick={onClear}>
        Clear filters
      </Button>
    </SimpleGrid>
  );
}
