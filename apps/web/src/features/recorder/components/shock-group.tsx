import { Box, SimpleGrid, Stack, Text } from '@chakra-ui/react';
import { memo } from 'react';
import type { DosingSheet, EnergyStep } from '@steadyhand/shared';
import { PadButton } from './pad-button';
import { PadSwitch } from './pad-switch';
import { PadGroup } from './pad-group';
import type { Tap } from './types';

interface ShockGroupProps {
  onTap: Tap;
  onOtherEnergy: () => void;
  synchronized: boolean;
  onSynchronized: (on: boolean) => void;
  disabled: boolean;
  pediatric: boolean;
  sheet: DosingSheet | null;
  presets: number[];
  defaultJoules: number;
  /** Pediatric: the weight-based step for the next shock. */
  nextStep: EnergyStep | null;
}

/**
 * Energies to record, never settings for the device. The synchronised switch is a full-width
 * bar that changes shape, words and colour, because mixing the two modes up is dangerous.
 */
export const ShockGroup = memo(function ShockGroup({
  onTap,
  onOtherEnergy,
  synchronized,
  onSynchronized,
  disabled,
  pediatric,
  sheet,
  presets,
  defaultJoules,
  nextStep,
}: ShockGroupProps) {
  const pedSteps =
    pediatric && sheet?.status === 'ready'
      ? synchronized
        ? sheet.cardioversion.steps
        : sheet.defibrillation.steps
      : [];
  return (
    <PadGroup title="Shock" id="shock" accent="signal.500" aria-describedby="shock-caution">
      <Stack gap="1.5">
        <PadSwitch
          on={synchronized}
          onToggle={onSynchronized}
          label="Synchronised shock"
          onText="SYNCHRONISED: ON"
          offText="Synchronised: off"
          onShape="triangle"
          tone="signal"
          disabled={disabled}
          data-testid="shock-sync"
        />
        {pediatric ? (
          pedSteps.length > 0 ? (
            <SimpleGrid columns={2} gap="1.5">
              {pedSteps.map((step) => {
                const isNext = nextStep !== null && step.shockNumber === nextStep.shockNumber;
                return (
                  <PadButton
                    key={`${step.shockNumber}-${step.synchronized}`}
                    // Records the low end of a range; another energy goes through Other energy.
                    label={`${synchronized ? 'Sync ' : ''}${Math.round(step.joules)} J`}
                    detail={
                      <>
                        <Box>{`${step.repeats ? `Shock ${step.shockNumber}+` : `Shock ${step.shockNumber}`}${isNext ? ' · next' : ''}${step.joulesHigh !== null ? ` · range ${step.display}` : ''}`}</Box>
                        {/* A range's long formula is read out, not printed: the pad keeps to one screen. */}
                        {step.joulesHigh === null ? (
                          <Box fontWeight="normal">
                            {step.formula}
                            {step.capNote ? ` (${step.capNote})` : ''}
                          </Box>
                        ) : null}
                      </>
                    }
                    emphasis={isNext}
                    height="compact"
                    colorPalette="ink"
                    disabled={disabled}
                    data-testid={`shock-${Math.round(step.joules)}`}
                    aria-label={`${synchronized ? 'Synchronised shock' : 'Shock'} ${Math.round(step.joules)} joules. ${step.formula}${step.capNote ? ` (${step.capNote})` : ''}`}
                    onClick={() =>
                      onTap({ kind: 'shock', joules: Math.round(step.joules), synchronized })
                    }
                  />
                );
              })}
              <PadButton
                label="Other energy"
                height="compact"
                disabled={disabled}
                data-testid="shock-other"
                aria-label="Shock at another energy"
                onClick={onOtherEnergy}
              />
            </SimpleGrid>
          ) : (
            <Stack gap="1.5">
            <Text
              textStyle="md"
              fontWeight="bold"
              color="alarm.700"
              data-testid="shock-weight-needed"
            >
              Weight needed for pediatric energies: use Other energy, or set the weight in Details.
            </Text>
              <PadButton
                label="Other energy"
                height="compact"
                disabled={disabled}
                data-testid="shock-other"
                aria-label="Shock at another energy"
                onClick={onOtherEnergy}
              />
            </Stack>
          )
        ) : (
          <SimpleGrid columns={3} gap="1.5">
            {presets.map((j) => (
              <PadButton
                key={j}
                label={`${j} J`}
                detail={
                  j === defaultJoules
                    ? synchronized
                      ? 'default · SYNC'
                      : 'default'
                    : synchronized
                      ? 'SYNC'
                      : undefined
                }
                emphasis={j === defaultJoules}
                height="compact"
                colorPalette="ink"
                disabled={disabled}
                data-testid={`shock-${j}`}
                aria-label={`${synchronized ? 'Synchronised shock' : 'Shock'} ${j} joules`}
                onClick={() => onTap({ kind: 'shock', joules: j, synchronized })}
              />
            ))}
            <PadButton
              label="Other J"
              height="compact"
              disabled={disabled}
              data-testid="shock-other"
              aria-label="Shock at another energy"
              onClick={onOtherEnergy}
            />
          </SimpleGrid>
        )}
      </Stack>
    </PadGroup>
  );
});
