import { Box, SimpleGrid, Text } from '@chakra-ui/react';
import {
  doseUnitLabel,
  nextDoseFor,
  type DosingSheet,
  type DoseLine,
  type DrugDefinition,
  type ProtocolSettings,
} from '@steadyhand/shared';
import { formatDose, ROUTE_WORDS } from '../../../lib/live/entry-words';
import { PadButton } from './pad-button';
import { PadGroup } from './pad-group';

export interface DrugTapPlan {
  drug: DrugDefinition;
  /** Null when no dose can be suggested (pediatric code without a weight): the tap asks for it. */
  dose: DoseLine | null;
}

interface DrugGroupProps {
  protocol: ProtocolSettings;
  sheet: DosingSheet | null;
  /** Doses of each catalogue drug so far (voided ones left out). */
  givenCount: (key: string) => number;
  pediatric: boolean;
  disabled: boolean;
  onDrug: (plan: DrugTapPlan) => void;
  onOtherDrug: () => void;
}

function doseSequence(
  drug: DrugDefinition,
  sheet: DosingSheet | null,
  given: number,
): string | null {
  const lines = sheet?.drugs.find((d) => d.key === drug.key)?.doses ?? [];
  if (lines.length < 2) return null;
  const next = Math.min(given, lines.length - 1);
  const later = lines[next + 1];
  return later ? `dose ${next + 1}, then ${later.display}` : `dose ${next + 1}`;
}

/**
 * One tap records the next dose from the protocol (or the weight-based sheet) by the default
 * route; the dose and route can be changed right after from the Undo bar.
 */
export function DrugGroup({
  protocol,
  sheet,
  givenCount,
  pediatric,
  disabled,
  onDrug,
  onOtherDrug,
}: DrugGroupProps) {
  return (
    <PadGroup title="Drugs" id="drugs" accent="seaglass.400">
      {pediatric ? (
        <Box
          bg="signal.50"
          borderWidth="2px"
          borderColor="signal.500"
          borderRadius="l2"
          px="3"
          py="2"
          mb="2"
          data-testid="pediatric-caution"
        >
          <Text textStyle="md" fontWeight="bold">
            Double-check every weight-based dose with a second person.
          </Text>
          <Text textStyle="sm">
            {sheet?.status === 'ready'
              ? `Doses for ${formatDose(sheet.weightKg ?? 0)} kg, ${sheet.edition}.`
              : 'Weight needed: no dose is suggested until the weight is set.'}
          </Text>
        </Box>
      ) : null}
      <SimpleGrid columns={{ base: 2, sm: 3, lg: 4 }} gap="2">
        {protocol.drugs.map((drug) => {
          const given = givenCount(drug.key);
          const dose = sheet ? nextDoseFor(sheet, drug.key, given) : null;
          const route = ROUTE_WORDS[drug.route];
          const seq = doseSequence(drug, sheet, given);
          return (
            <PadButton
              key={drug.key}
              label={drug.label}
              colorPalette="brand"
              emphasis={false}
              disabled={disabled}
              data-testid={`drug-${drug.key}`}
              aria-label={
                dose ? `${drug.label} ${dose.display} ${route}` : `${drug.label}, enter the dose`
              }
              detail={
                dose ? (
                  <>
                    <Box textStyle="md">{`${dose.display} ${route}`}</Box>
                    {seq ? <Box fontWeight="normal">{seq}</Box> : null}
                    {pediatric ? <Box fontWeight="normal">{dose.formula}</Box> : null}
                    {pediatric && dose.volumeText ? (
                      <Box fontWeight="normal">{dose.volumeText}</Box>
                    ) : null}
                    {dose.capNote ? <Box>{dose.capNote}</Box> : null}
                    {given > 0 ? <Box fontWeight="normal">{`${given} given`}</Box> : null}
                  </>
                ) : (
                  <Box>
                    {pediatric
                      ? 'Weight needed: tap to enter dose'
                      : `Enter dose (${doseUnitLabel(drug.unit)})`}
                  </Box>
                )
              }
              onClick={() => onDrug({ drug, dose })}
            />
          );
        })}
        <PadButton
          label="Other drug"
          detail="dose now, name at review"
          disabled={disabled}
          data-testid="drug-other"
          aria-label="Other drug"
          onClick={onOtherDrug}
        />
      </SimpleGrid>
    </PadGroup>
  );
}
