import { Box, SimpleGrid, Text } from '@chakra-ui/react';
import {
  doseUnitLabel,
  drugTotalText,
  type DosingSheet,
  type DoseLine,
  type DrugAggregate,
  type DrugDefinition,
  type NextDose,
  type ProtocolSettings,
} from '@steadyhand/shared';
import { useEffect, useState, memo } from 'react';
import { formatDose, ROUTE_WORDS } from '../../../lib/live/entry-words';
import { PadButton } from './pad-button';
import { PadGroup } from './pad-group';

export interface DrugTapPlan {
  drug: DrugDefinition;
  /** Null when no dose can be suggested (pediatric code without a weight): the tap asks for it. */
  dose: DoseLine | null;
}

/** How long a limit button stays armed for its second tap. Our own choice. */
export const LIMIT_CONFIRM_MS = 5_000;

interface DrugGroupProps {
  protocol: ProtocolSettings;
  sheet: DosingSheet | null;
  /** Per catalogue drug: the next dose, or the limit reached (the clinical core's reading). */
  nextDoses: Readonly<Record<string, NextDose>>;
  /** What has been given so far, per drug (voided doses left out). */
  totals: readonly DrugAggregate[];
  pediatric: boolean;
  disabled: boolean;
  onDrug: (plan: DrugTapPlan) => void;
  onOtherDrug: () => void;
}

/**
 * One tap records the next dose from the protocol (or the weight-based sheet) by the default
 * route; the dose and route can be changed right after from the Undo bar.
 */
export const DrugGroup = memo(function DrugGroup({ protocol, sheet, nextDoses, totals, pediatric, disabled, onDrug, onOtherDrug }: DrugGroupProps) {
  // A drug past its limit asks for a second tap: the first arms it, the second records.
  const [armed, setArmed] = useState<string | null>(null);
  useEffect(() => {
    if (armed === null) return;
    const timer = setTimeout(() => setArmed(null), LIMIT_CONFIRM_MS);
    return () => clearTimeout(timer);
  }, [armed]);
  return (
    <PadGroup title="Drugs" id="drugs" accent="seaglass.400">
      {pediatric ? (
        <Box bg="signal.50" borderWidth="2px" borderColor="signal.500" borderRadius="l2" px="2" py="0.5" mb="1.5" data-testid="pediatric-caution">
          <Text textStyle="xs" lineHeight="1.3">
            <Text as="span" fontWeight="bold">
              Double-check every weight-based dose with a second person.
            </Text>{' '}
            {sheet?.status === 'ready'
              ? `Doses for ${formatDose(sheet.weightKg ?? 0)} kg (sheet in Code details).`
              : 'Weight needed: no dose is suggested until the weight is set.'}
          </Text>
        </Box>
      ) : null}
      <SimpleGrid columns={{ base: 2, sm: 3, md: 6 }} gap="1.5">
        {protocol.drugs.map((drug) => {
          const next = nextDoses[drug.key];
          const dose = next?.line ?? null;
          const limit = next?.limit ?? null;
          const dosing = sheet?.drugs.find((d) => d.key === drug.key);
          const given = totals.find((t) => t.key === drug.key);
          const route = ROUTE_WORDS[drug.route];
          const isArmed = armed === drug.key;
          const detail = limit ? (
            <>
              <Box textStyle="sm" data-testid={`drug-limit-${drug.key}`}>
                {limit.message}
              </Box>
              <Box>{isArmed ? `Tap again to record ${dose?.display ?? ''} anyway` : 'Tap twice to record another'}</Box>
            </>
          ) : dose ? (
            <>
              <Box textStyle="sm">{`${dose.display} ${route}`}</Box>
              {pediatric || dose.basis !== 'fixed' ? <Box fontWeight="normal">{dose.formula}</Box> : null}
              {dose.volumeText || (dosing && dosing.maxDoses !== null) ? (
                <Box fontWeight="normal">
                  {[dose.volumeText, dosing && dosing.maxDoses !== null ? `dose ${dose.doseNumber} of ${dosing.maxDoses}` : null].filter(Boolean).join(' · ')}
                </Box>
              ) : null}
              {dose.capNote ? <Box>{dose.capNote}</Box> : null}
              {given ? <Box fontWeight="normal">{`${given.doseCount} given · ${drugTotalText(given)}`}</Box> : null}
            </>
          ) : (
            <Box>{pediatric ? 'Weight needed: tap to enter dose' : `Enter dose (${doseUnitLabel(drug.unit)})`}</Box>
          );
          return (
            <PadButton
              key={drug.key}
              label={drug.label}
              height="compact"
              labelSize="sm"
              colorPalette={limit ? 'signal' : 'brand'}
              emphasis={isArmed}
              disabled={disabled}
              data-testid={`drug-${drug.key}`}
              data-limit={limit ? limit.kind : undefined}
              aria-label={
                limit
                  ? `${drug.label}: ${limit.message}. ${isArmed ? 'Tap again to record anyway' : 'Tap twice to record another'}`
                  : dose
                    ? `${drug.label} ${dose.display} ${route}`
                    : `${drug.label}, enter the dose`
              }
              detail={detail}
              onClick={() => {
                if (limit && !isArmed) {
                  setArmed(drug.key);
                  return;
                }
                setArmed(null);
                onDrug({ drug, dose });
              }}
            />
          );
        })}
        <PadButton
          label="Other drug"
          height="compact"
          labelSize="sm"
          detail="dose now, name at review"
          disabled={disabled}
          data-testid="drug-other"
          aria-label="Other drug"
          onClick={onOtherDrug}
        />
      </SimpleGrid>
    </PadGroup>
  );
});
