import { Box, Button, Flex, Input, SimpleGrid, Stack, Text } from '@chakra-ui/react';
import { estimateWeightFromAge, WEIGHT_ESTIMATE_SOURCE, type Code, type UpdateCodeRequest, type WeightSource } from '@steadyhand/shared';
import { useState } from 'react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { usePlaces } from '../api/get-places';
import { useUpdateCode } from '../api/update-code';
import { formatDose } from '../../../lib/live/entry-words';
import { EditorPanel } from './editor-panel';
import { NumberEditor } from './editors';
import { PadGroup } from './pad-group';

export const WEIGHT_SOURCE_WORDS: Record<WeightSource, string> = {
  measured: 'measured',
  stated: 'stated or from the chart',
  'length-tape': 'length-based tape',
  'estimated-age': 'ESTIMATE from age',
};

const AGES: { label: string; months: number }[] = [
  { label: 'Newborn', months: 0 },
  { label: '3 months', months: 3 },
  { label: '6 months', months: 6 },
  { label: '9 months', months: 9 },
  ...Array.from({ length: 12 }, (_, i) => ({ label: `${i + 1} year${i === 0 ? '' : 's'}`, months: (i + 1) * 12 })),
];

/** A weight from age when nobody can weigh the child: always saved and shown as an estimate. */
function AgeEstimate({ onSave, onCancel }: { onSave: (kg: number) => void; onCancel: () => void }) {
  const [months, setMonths] = useState<number | null>(null);
  const estimate = months === null ? null : estimateWeightFromAge(months);
  return (
    <EditorPanel title="Weight estimate from age" onCancel={onCancel} testId="age-estimate">
      <Stack gap="3">
        <Text textStyle="sm" fontWeight="bold">
          An estimate only: weigh the child or use the length-based tape as soon as you can. Double-check every dose.
        </Text>
        <SimpleGrid columns={4} gap="2">
          {AGES.map((a) => (
            <Button key={a.months} minH="12" h="auto" whiteSpace="normal" variant={months === a.months ? 'solid' : 'outline'} colorPalette="ink" onClick={() => setMonths(a.months)}>
              {a.label}
            </Button>
          ))}
        </SimpleGrid>
        {estimate ? (
          <Box bg="signal.50" borderWidth="2px" borderColor="signal.500" borderRadius="l2" p="2" data-testid="age-estimate-result">
            <Text fontWeight="bold">{estimate.formula}</Text>
            <Text textStyle="xs">{WEIGHT_ESTIMATE_SOURCE}</Text>
          </Box>
        ) : null}
        <Button minH="16" colorPalette="brand" disabled={!estimate} onClick={() => estimate && onSave(estimate.weightKg)}>
          Use {estimate ? `${formatDose(estimate.weightKg)} kg` : 'the estimate'} (marked as an estimate)
        </Button>
      </Stack>
    </EditorPanel>
  );
}

/** Adult or pediatric, the weight and the place, at any time during the code. */
export function CodeDetails({
  code,
  canWrite,
  onSaved,
}: {
  code: Code;
  canWrite: boolean;
  onSaved: (code: Code) => void;
}) {
  const update = useUpdateCode(code.id, { onSuccess: onSaved });
  // The admin's list of units; without it (offline, not loaded) any place can still be written in.
  const units = (usePlaces().data?.units ?? []).filter((u) => u.active);
  const [weightOpen, setWeightOpen] = useState(false);
  const [ageOpen, setAgeOpen] = useState(false);
  const [source, setSource] = useState<WeightSource>(code.weightSource === 'estimated-age' || code.weightSource === null ? 'measured' : code.weightSource);
  const [otherPlace, setOtherPlace] = useState<string | null>(null);
  const save = (changes: UpdateCodeRequest) => update.mutate(changes);
  const disabled = !canWrite || update.isPending;

  return (
    <PadGroup title="Code details" id="details" accent="ink.300">
      <Stack gap="3">
        <SimpleGrid columns={2} gap="2" role="radiogroup" aria-label="Patient">
          {(['adult', 'pediatric'] as const).map((c) => (
            <Button
              key={c}
              role="radio"
              aria-checked={code.category === c}
              minH="16"
              variant={code.category === c ? 'solid' : 'outline'}
              colorPalette="ink"
              bg={code.category === c ? undefined : 'white'}
              borderWidth="2px"
              disabled={disabled}
              data-testid={`details-${c}`}
              onClick={() => code.category !== c && save({ category: c })}
            >
              {c === 'adult' ? 'Adult' : 'Pediatric'}
            </Button>
          ))}
        </SimpleGrid>
        <Button
          minH="16"
          variant="outline"
          bg="white"
          colorPalette="ink"
          borderWidth="2px"
          disabled={disabled}
          data-testid="details-weight"
          onClick={() => setWeightOpen(true)}
        >
          {code.weightKg !== null
            ? `Weight ${formatDose(code.weightKg)} kg${code.weightSource ? ` (${WEIGHT_SOURCE_WORDS[code.weightSource]})` : ''} · change`
            : 'Set weight (kg)'}
        </Button>
        {code.category === 'pediatric' ? (
          <Button minH="16" variant="outline" bg="white" colorPalette="ink" borderWidth="2px" disabled={disabled} data-testid="details-age-estimate" onClick={() => setAgeOpen(true)}>
            Estimate the weight from age
          </Button>
        ) : null}
        <Box>
          <Text textStyle="sm" fontWeight="bold" mb="1">
            Location: <span data-testid="details-location">{code.location ?? 'not set'}</span>
          </Text>
          <SimpleGrid columns={2} gap="2">
            {units.map((unit) => (
              <Button
                key={unit.id}
                minH="16"
                h="auto"
                whiteSpace="normal"
                variant={code.location === unit.name ? 'solid' : 'outline'}
                colorPalette="ink"
                bg={code.location === unit.name ? undefined : 'white'}
                disabled={disabled}
                onClick={() => save({ location: unit.name, unitId: unit.id })}
              >
                {unit.name}
              </Button>
            ))}
            <Button
              minH="16"
              variant="outline"
              bg="white"
              disabled={disabled}
              onClick={() => setOtherPlace(code.location ?? '')}
            >
              Other place…
            </Button>
          </SimpleGrid>
          {otherPlace !== null ? (
            <Flex gap="2" mt="2">
              <Input
                aria-label="Location"
                value={otherPlace}
                maxLength={120}
                onChange={(e) => setOtherPlace(e.target.value)}
                placeholder="e.g. 4 West bed 12"
              />
              <Button
                minH="12"
                colorPalette="brand"
                disabled={otherPlace.trim() === ''}
                onClick={() => {
                  save({ location: otherPlace.trim() });
                  setOtherPlace(null);
                }}
              >
                Save
              </Button>
            </Flex>
          ) : null}
        </Box>
        {update.isError ? (
          <ErrorMessage
            title="Details not saved"
            message={`${update.error.message} Details need the server; every tap is still kept on this tablet.`}
          />
        ) : null}
      </Stack>
      {weightOpen ? (
        <NumberEditor
          title="Patient weight"
          unit="kg"
          min={0.3}
          max={250}
          allowDecimal
          initial={code.weightKg}
          saveLabel="Save weight"
          note={
            <Stack gap="2">
              <Text textStyle="sm">Every weight-based dose is computed from this number. How was it obtained?</Text>
              <SimpleGrid columns={3} gap="2" role="radiogroup" aria-label="How the weight was obtained">
                {(['measured', 'stated', 'length-tape'] as const).map((src) => (
                  <Button
                    key={src}
                    role="radio"
                    aria-checked={source === src}
                    minH="12"
                    h="auto"
                    whiteSpace="normal"
                    variant={source === src ? 'solid' : 'outline'}
                    colorPalette="ink"
                    data-testid={`weight-source-${src}`}
                    onClick={() => setSource(src)}
                  >
                    {WEIGHT_SOURCE_WORDS[src]}
                  </Button>
                ))}
              </SimpleGrid>
            </Stack>
          }
          onCancel={() => setWeightOpen(false)}
          onSave={(kg) => {
            save({ weightKg: kg, weightSource: source });
            setWeightOpen(false);
          }}
        />
      ) : null}
      {ageOpen ? (
        <AgeEstimate
          onCancel={() => setAgeOpen(false)}
          onSave={(kg) => {
            save({ weightKg: kg, weightSource: 'estimated-age' });
            setAgeOpen(false);
          }}
        />
      ) : null}
    </PadGroup>
  );
}
