import { Box, Button, Flex, Input, SimpleGrid, Stack, Text } from '@chakra-ui/react';
import type { Code, UpdateCodeRequest } from '@steadyhand/shared';
import { useState } from 'react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { usePlaces } from '../api/get-places';
import { useUpdateCode } from '../api/update-code';
import { formatDose } from '../../../lib/live/entry-words';
import { NumberEditor } from './editor-panel';
import { PadGroup } from './pad-group';

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
            ? `Weight ${formatDose(code.weightKg)} kg · change`
            : 'Set weight (kg)'}
        </Button>
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
            <Text textStyle="sm">
              Measured, estimated or from a length-based tape. Every weight-based dose is computed
              from this number.
            </Text>
          }
          onCancel={() => setWeightOpen(false)}
          onSave={(kg) => {
            save({ weightKg: kg });
            setWeightOpen(false);
          }}
        />
      ) : null}
    </PadGroup>
  );
}
