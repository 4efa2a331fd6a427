import { Box, Button, Flex, Grid, Stack, Text } from '@chakra-ui/react';
import {
  computeDosing,
  deriveLiveStateFromLive,
  doseUnitLabel,
  effectiveEntries,
  entryTimeMs,
  formatElapsedMs,
  LIVE_REMINDER_CAUTION,
  nextDoseFor,
  nextShockJoules,
  type Code,
  type DosingSheet,
  type LiveDrugTotal,
  type LiveState,
  type ProtocolSettings,
} from '@steadyhand/shared';
import { useQueryClient } from '@tanstack/react-query';
import dayjs from 'dayjs';
import { useEffect, useMemo, useRef } from 'react';
import { Link as RouterLink } from 'react-router';
import { Shape } from '../../../components/ui/shapes';
import { paths } from '../../../config/paths';
import { describeEntry, formatDose, OUTCOME_WORDS, RHYTHM_WORDS } from '../../../lib/live/entry-words';
import {
  codeDetailQueryKey,
  protocolQueryKey,
  useLiveCode,
  type LiveSyncState,
} from '../../../lib/live/use-live-code';
import { useSecondTick } from '../../../lib/live/use-second-tick';
import { useSoundCue } from '../hooks/use-sound-cue';
import { compressionReading, dueCueKeys, epinephrineReading, fractionText } from '../lib/wall-states';
import { ArrestClock } from './arrest-clock';
import { FactBlock, PanelLabel, ReadingBlock, WallBox } from './wall-parts';

/** The wall calls the link stale this long after the last word from the server (it pings every 4 s). */
export const STALE_AFTER_MS = 9_000;
const WALL_RECENT = 6;
export const PEDIATRIC_DOSE_CAUTION = 'Double-check every weight-based dose with a second person';

function safeDosing(code: Code, protocol: ProtocolSettings): DosingSheet | null {
  try {
    return computeDosing({ category: code.category, weightKg: code.weightKg }, protocol);
  } catch {
    return null;
  }
}

/**
 * Link state for the wall: stale once disconnected or silent too long. `lastContactAt` is on the
 * device's clock, so the age is taken against the device time of the tick (corrected minus offset).
 */
export function linkReading(sync: LiveSyncState, correctedNowMs: number, offsetMs: number) {
  const deviceNowMs = correctedNowMs - offsetMs;
  const ageMs = sync.lastContactAt === null ? null : Math.max(0, deviceNowMs - sync.lastContactAt);
  const stale = !sync.connected || ageMs === null || ageMs > STALE_AFTER_MS;
  return { stale, ageMs };
}

function ageWords(ageMs: number | null): string {
  if (ageMs === null) return 'no update yet';
  const s = Math.floor(ageMs / 1000);
  return s < 60 ? `${s} s ago` : `${formatElapsedMs(ageMs)} ago`;
}

/** The timer wall for one code, for the leader across the room. */
export function WallScreen({ codeId }: { codeId: string }) {
  const live = useLiveCode(codeId);
  const { code, protocol } = live;
  if (code && protocol) return <Wall live={live} code={code} protocol={protocol} />;
  if (live.codeError)
    return (
      <Stack p="10" gap="4" data-testid="wall-problem">
        <Text fontSize="3rem" fontWeight="bold">
          This code cannot be shown
        </Text>
        <Text fontSize="1.6rem">{live.codeError.message}</Text>
        <Button asChild size="2xl" variant="outline" color="white" alignSelf="start">
          <RouterLink to={paths.wallBoard.getHref()}>All live codes</RouterLink>
        </Button>
      </Stack>
    );
  return (
    <Text p="10" fontSize="3rem" role="status">
      Opening the wall…
    </Text>
  );
}

function Wall({
  live,
  code,
  protocol,
}: {
  live: ReturnType<typeof useLiveCode>;
  code: Code;
  protocol: ProtocolSettings;
}) {
  const { entries, clock, sync } = live;
  const nowMs = useSecondTick(clock.correctedNow);
  const effective = useMemo(() => effectiveEntries(entries), [entries]);
  const counting = useMemo(() => effective.filter((e) => e.voided === null), [effective]);
  const byId = useMemo(() => new Map(entries.map((e) => [e.id, e])), [entries]);
  const sheet = useMemo(
    () => (code.category === 'pediatric' ? safeDosing(code, protocol) : null),
    [code, protocol],
  );
  const s = deriveLiveStateFromLive({
    code,
    settings: protocol,
    nowMs,
    liveEntries: counting,
    recentCount: WALL_RECENT,
  });

  // Back from a lost link: the live layer rejoins from its cursor; the code's details and the
  // protocol are fetched again too, so everything on the wall is fresh.
  const queryClient = useQueryClient();
  const wasConnected = useRef(sync.connected);
  useEffect(() => {
    if (sync.connected && !wasConnected.current) {
      void queryClient.invalidateQueries({ queryKey: codeDetailQueryKey(code.id) });
      void queryClient.invalidateQueries({ queryKey: protocolQueryKey });
    }
    wasConnected.current = sync.connected;
  }, [sync.connected, queryClient, code.id]);

  const cue = useSoundCue(dueCueKeys(s));
  const link = linkReading(sync, nowMs, clock.offsetMs);
  const arrestAtMs = Date.parse(code.arrestAt);
  const pediatric = code.category === 'pediatric';
  const rhythm = s.rhythm.current;

  return (
    <Stack
      gap="3"
      p="4"
      minH="100dvh"
      data-testid="wall"
      data-code-id={code.id}
      data-stale={String(link.stale)}
      fontFamily="body"
    >
      <Flex align="center" justify="space-between" gap="4" wrap="wrap">
        <Text as="h1" fontSize="2.6rem" fontWeight="bold" lineHeight="1.1" data-testid="wall-heading">
          {pediatric ? 'Pediatric' : 'Adult'} code · {code.location ?? 'location not set'}
        </Text>
        <Flex align="center" gap="3" wrap="wrap">
          <Flex
            align="center"
            gap="2"
            fontSize="1.6rem"
            fontWeight="bold"
            data-testid="wall-link-state"
            data-connected={String(sync.connected)}
          >
            <Shape
              kind={link.stale ? 'octagon' : 'check'}
              size="1.8rem"
              color={link.stale ? 'alarm.400' : 'seaglass.400'}
            />
            {link.stale ? 'Link lost' : 'Live'} · updated {ageWords(link.ageMs)}
          </Flex>
          <Button
            size="lg"
            variant={cue.on ? 'solid' : 'outline'}
            colorPalette="brand"
            color="white"
            borderColor="ink.300"
            onClick={cue.toggle}
            aria-pressed={cue.on}
            data-testid="wall-sound"
          >
            Sound cue: {cue.on ? 'on' : 'off'}
          </Button>
          <Button asChild size="lg" variant="outline" color="white" borderColor="ink.300">
            <RouterLink to={paths.wallBoard.getHref()}>All live codes</RouterLink>
          </Button>
          <Button asChild size="lg" variant="outline" color="white" borderColor="ink.300">
            <RouterLink to={paths.codes.record.getHref(code.id)}>Pad</RouterLink>
          </Button>
        </Flex>
      </Flex>

      {link.stale ? (
        <Flex
          role="alert"
          align="center"
          gap="4"
          bg="alarm.600"
          color="white"
          borderWidth="4px"
          borderColor="white"
          borderRadius="l3"
          px="5"
          py="3"
          data-testid="wall-stale-banner"
        >
          <Shape kind="octagon" size="3.5rem" />
          <Box>
            <Text fontSize="2.6rem" fontWeight="black" lineHeight="1.1">
              Not connected — last update {ageWords(link.ageMs)}
            </Text>
            <Text fontSize="1.6rem" fontWeight="bold">
              Clocks keep running from the last entries this screen received; new taps will not show until the link
              returns.
            </Text>
          </Box>
        </Flex>
      ) : null}

      {s.status === 'ended' ? (
        <Box bg="ink.700" borderRadius="l3" px="5" py="2" data-testid="wall-ended">
          <Text fontSize="2.2rem" fontWeight="bold">
            Code ended at {formatElapsedMs((s.endedAtMs ?? arrestAtMs) - arrestAtMs)}
            {s.outcome ? `: ${OUTCOME_WORDS[s.outcome]}` : ''}
          </Text>
        </Box>
      ) : null}

      <Grid templateColumns="1.05fr 1fr 1fr" gap="3">
        <Stack
          gap="0"
          bg="ink.900"
          borderWidth="4px"
          borderColor={s.status === 'rosc' ? 'seaglass.400' : 'ink.500'}
          borderRadius="l3"
          px="5"
          py="3"
          minW="0"
        >
          <Flex justify="space-between" align="center">
            <PanelLabel>Since arrest</PanelLabel>
            <Text fontSize="2.2rem" fontWeight="black">
              {s.status === 'ended' ? 'ENDED' : s.status === 'rosc' ? 'ROSC' : 'ARREST'}
            </Text>
          </Flex>
          <ArrestClock
            arrestAtMs={arrestAtMs}
            frozenAtMs={s.endedAtMs}
            correctedNow={clock.correctedNow}
            testId="wall-arrest-clock"
            fontSize="10rem"
          />
          <Text fontSize="1.9rem" fontWeight="bold">
            Arrest at {dayjs(arrestAtMs).format('HH:mm:ss')}
          </Text>
        </Stack>
        <ReadingBlock label="Compressions" reading={compressionReading(s)} testId="wall-compressions" />
        <ReadingBlock label="Epinephrine" reading={epinephrineReading(s)} testId="wall-epinephrine" />
      </Grid>

      <Grid templateColumns="repeat(4, minmax(0, 1fr))" gap="3">
        <FactBlock
          label="Rhythm"
          value={rhythm ? RHYTHM_WORDS[rhythm.rhythm] : '—'}
          note={
            rhythm
              ? `${rhythm.pulse ? 'Pulse present' : 'No pulse'} · ${formatElapsedMs(s.clockMs - rhythm.atMs)} ago`
              : 'Not checked yet'
          }
          testId="wall-rhythm"
        />
        <FactBlock
          label="Shocks"
          value={String(s.shocks.count)}
          note={
            s.shocks.lastJoules !== null
              ? `Last ${formatDose(s.shocks.lastJoules)} J · ${s.shocks.lastSynchronized ? 'SYNCHRONISED' : 'not synchronised'}`
              : 'None yet'
          }
          testId="wall-shocks"
        />
        <FactBlock
          label="Compression fraction"
          value={fractionText(s.compressions.fraction)}
          note={
            s.compressions.fraction === null
              ? 'From the first compressions'
              : `${formatElapsedMs(s.compressions.compressionMs)} of ${formatElapsedMs(s.compressions.arrestWindowMs)}`
          }
          testId="wall-fraction"
        />
        <WallBox testId="wall-drugs">
          <PanelLabel>Drugs given</PanelLabel>
          <DrugTotals totals={s.drugTotals} />
        </WallBox>
      </Grid>

      <Grid templateColumns={pediatric ? '1.2fr 1fr' : '1fr'} gap="3" flex="1">
        <WallBox testId="wall-recent">
          <PanelLabel>Last entries</PanelLabel>
          <RecentList s={s} arrestAtMs={arrestAtMs} protocol={protocol} byId={byId} />
        </WallBox>
        {pediatric ? <PediatricDosing code={code} sheet={sheet} s={s} /> : null}
      </Grid>

      <Box borderTopWidth="2px" borderColor="ink.600" pt="2" data-testid="wall-caution">
        <Text fontSize="1.25rem" fontWeight="bold">
          {LIVE_REMINDER_CAUTION}
        </Text>
        <Text fontSize="1.1rem" color="ink.100">
          Protocol: {protocol.edition}. Timers follow the entries as tapped: a late tap moves them. Clock offset to
          the server {Math.round(clock.offsetMs)} ms
          {clock.uncertaintyMs !== null ? ` ± ${Math.round(clock.uncertaintyMs)} ms` : ' (being measured)'}.
        </Text>
      </Box>
    </Stack>
  );
}

function totalText(t: LiveDrugTotal): string {
  if (t.totalInCatalogueUnit !== null && t.catalogueUnit && t.allConverted)
    return `${formatDose(t.totalInCatalogueUnit)} ${doseUnitLabel(t.catalogueUnit)}`;
  return t.byUnit.map((u) => `${formatDose(u.total)} ${doseUnitLabel(u.unit)}`).join(' + ');
}

function DrugTotals({ totals }: { totals: readonly LiveDrugTotal[] }) {
  if (totals.length === 0)
    return (
      <Text fontSize="2rem" fontWeight="bold">
        None yet
      </Text>
    );
  return (
    <Stack gap="0">
      {totals.slice(0, 4).map((t) => (
        <Flex key={t.key} justify="space-between" gap="3" fontSize="1.8rem" fontWeight="bold" lineHeight="1.25">
          <Text truncate>{t.label}</Text>
          <Text flexShrink={0} fontVariantNumeric="tabular-nums">
            {totalText(t)} ×{t.doseCount}
          </Text>
        </Flex>
      ))}
      {totals.length > 4 ? <Text fontSize="1.4rem">and {totals.length - 4} more</Text> : null}
    </Stack>
  );
}

function RecentList({
  s,
  arrestAtMs,
  protocol,
  byId,
}: {
  s: LiveState;
  arrestAtMs: number;
  protocol: ProtocolSettings;
  byId: ReadonlyMap<string, ReturnType<typeof useLiveCode>['entries'][number]>;
}) {
  if (s.recent.length === 0)
    return (
      <Text fontSize="2rem" fontWeight="bold">
        No entries yet
      </Text>
    );
  return (
    <Stack as="ol" gap="0" listStyleType="none" m="0" p="0">
      {s.recent.map((e, i) => {
        const at = entryTimeMs(e);
        return (
          <Flex
            as="li"
            key={e.id}
            gap="5"
            align="baseline"
            fontSize={i === 0 ? '2.8rem' : '2.2rem'}
            fontWeight={i === 0 ? 'black' : 'bold'}
            lineHeight="1.3"
            opacity={i === 0 ? 1 : 0.92}
            data-testid={i === 0 ? 'wall-last-entry' : 'wall-entry'}
            data-entry-id={e.id}
          >
            <Text as="span" minW="11rem" fontVariantNumeric="tabular-nums" flexShrink={0}>
              +{formatElapsedMs(at - arrestAtMs)}
            </Text>
            <Text as="span" truncate flex="1">
              {describeEntry(e, protocol, byId)}
              {e.amendments.length > 0 ? ' (corrected)' : ''}
            </Text>
            <Text as="span" fontSize="1.4rem" color="ink.100" flexShrink={0} fontVariantNumeric="tabular-nums">
              {dayjs(at).format('HH:mm:ss')}
            </Text>
          </Flex>
        );
      })}
    </Stack>
  );
}

function PediatricDosing({ code, sheet, s }: { code: Code; sheet: DosingSheet | null; s: LiveState }) {
  const given = (key: string) => s.drugTotals.find((d) => d.key === key)?.doseCount ?? 0;
  return (
    <Box
      bg="ink.900"
      borderWidth="4px"
      borderColor="signal.300"
      borderRadius="l3"
      px="4"
      py="3"
      minW="0"
      data-testid="wall-dosing"
    >
      <Flex justify="space-between" align="baseline" gap="3">
        <PanelLabel>Weight-based doses</PanelLabel>
        <Text fontSize="2.4rem" fontWeight="black" data-testid="wall-weight">
          {code.weightKg !== null ? `${formatDose(code.weightKg)} kg` : 'Weight needed'}
        </Text>
      </Flex>
      <Flex align="center" gap="2" color="signal.200" fontSize="1.35rem" fontWeight="bold" my="1">
        <Shape kind="triangle" size="1.8rem" />
        <Text>{PEDIATRIC_DOSE_CAUTION}</Text>
      </Flex>
      {!sheet || sheet.status !== 'ready' ? (
        <Text fontSize="1.8rem" fontWeight="bold">
          {sheet?.message ?? 'Doses cannot be computed for this code.'}
        </Text>
      ) : (
        <Stack gap="0.5">
          {sheet.drugs
            .filter((d) => d.doses.length > 0)
            .slice(0, 4)
            .map((d) => {
              const line = nextDoseFor(sheet, d.key, given(d.key));
              if (!line) return null;
              return (
                <Box key={d.key}>
                  <Text fontSize="1.6rem" fontWeight="bold" lineHeight="1.15">
                    {d.label} dose {line.doseNumber}: {line.display}
                    {line.volumeText ? ` · ${line.volumeText}` : ''}
                  </Text>
                  <Text fontSize="1.15rem" lineHeight="1.3" color="ink.100">
                    {line.formula}
                    {line.capNote ? ` (${line.capNote})` : ''}
                  </Text>
                </Box>
              );
            })}
          {(['defibrillation', 'cardioversion'] as const).map((mode) => {
            const step = nextShockJoules(sheet, s.shocks.count, mode);
            if (!step) return null;
            return (
              <Box key={mode}>
                <Text fontSize="1.6rem" fontWeight="bold" lineHeight="1.15">
                  {mode === 'defibrillation' ? 'Shock (not synchronised)' : 'SYNCHRONISED cardioversion'}:{' '}
                  {step.display}
                </Text>
                <Text fontSize="1.15rem" lineHeight="1.3" color="ink.100">
                  {step.formula}
                  {step.capNote ? ` (${step.capNote})` : ''}
                </Text>
              </Box>
            );
          })}
          <Text fontSize="1.1rem" color="ink.100">
            The defibrillator maker&apos;s settings come first; protocol in the footer.
          </Text>
        </Stack>
      )}
    </Box>
  );
}
