import { Box, Button, Flex, Grid, Stack, Text } from '@chakra-ui/react';
import {
  compressionReading,
  drugTotalText,
  dueCueKeys,
  entryTimeMs,
  epinephrineReading,
  flaggedDoseText,
  formatElapsedMs,
  fractionReading,
  REMINDER_CAUTION,
  REMINDER_WORDS,
  rhythmReading,
  shockReading,
  stateAt,
  TAPS_NOT_SENSOR,
  type Code,
  type CodeState,
  type DrugAggregate,
  type LogEntry,
  type ProtocolSettings,
  type Reminder,
} from '@steadyhand/shared';
import { useQueryClient } from '@tanstack/react-query';
import dayjs from 'dayjs';
import { useEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import { Link as RouterLink } from 'react-router';
import { CodePictureView } from '../../../components/code-picture';
import { Shape } from '../../../components/ui/shapes';
import { paths } from '../../../config/paths';
import { describeEntry, formatDose, OUTCOME_WORDS } from '../../../lib/live/entry-words';
import { lastMoment, useCodeTimeline } from '../../../lib/live/use-code-timeline';
import { codeDetailQueryKey, useLiveCode, type LiveSyncState } from '../../../lib/live/use-live-code';
import { protocolKeys } from '../../../lib/protocol';
import { useSecondTick } from '../../../lib/live/use-second-tick';
import { useSoundCue } from '../hooks/use-sound-cue';
import { ArrestClock } from './arrest-clock';
import { FactBlock, PanelLabel, ReadingBlock, WallBox, WALL_TONES } from './wall-parts';

/** The wall calls the link stale this long after the last word from the server (it pings every 4 s). */
export const STALE_AFTER_MS = 9_000;
/** The wall's picture shows this much of the code: the last two cycles and more. */
const WALL_PICTURE_MS = 10 * 60_000;
const WALL_RECENT = 6;
export const PEDIATRIC_DOSE_CAUTION = 'Double-check every weight-based dose with a second person';

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

/** A device clock's offset in words: "this screen's clock is 7 min fast; times are corrected". */
export function clockOffsetWords(offsetMs: number, uncertaintyMs: number | null): string {
  if (uncertaintyMs === null) return "This screen's clock is being compared with the server's.";
  const size = Math.abs(offsetMs);
  // The offset is what is added to this clock to read the server's: a negative offset means this clock is fast.
  const way = offsetMs < 0 ? 'fast' : 'slow';
  if (size < 1000) return "This screen's clock agrees with the server's to within a second.";
  const amount = size < 60_000 ? `${Math.round(size / 1000)} s` : size < 3_600_000 ? `${Math.round(size / 60_000)} min` : `${(size / 3_600_000).toFixed(1)} h`;
  return `This screen's clock is ${amount} ${way}; times are corrected.`;
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
  const tickMs = useSecondTick(clock.correctedNow);
  const timeline = useCodeTimeline(code, protocol, entries);
  // The tick is whole seconds: an entry tapped since the last one is shown at once, not up to a second later.
  const nowMs = Math.max(tickMs, lastMoment(timeline));
  // A child's wall also carries the doses: fewer last entries, so nothing scrolls.
  const s = stateAt(timeline, nowMs, { recentCount: code.category === 'pediatric' ? 4 : WALL_RECENT });

  // Back from a lost link: the live layer rejoins from its cursor; the code's details are fetched
  // again too (a protocol version never changes), so everything on the wall is fresh.
  const queryClient = useQueryClient();
  const wasConnected = useRef(sync.connected);
  useEffect(() => {
    if (sync.connected && !wasConnected.current) {
      void queryClient.invalidateQueries({ queryKey: codeDetailQueryKey(code.id) });
      void queryClient.invalidateQueries({ queryKey: protocolKeys.document });
    }
    wasConnected.current = sync.connected;
  }, [sync.connected, queryClient, code.id]);

  const cue = useSoundCue(dueCueKeys(s));
  const link = linkReading(sync, nowMs, clock.offsetMs);
  // The picture of the last 10 minutes takes the place of the last entries when the leader asks.
  const [picture, setPicture] = useState(false);

  return (
    <Stack gap="3" p="4" minH="100dvh" data-testid="wall" data-code-id={code.id} data-stale={String(link.stale)} fontFamily="body">
      <Flex align="center" justify="space-between" gap="4" wrap="wrap">
        <WallHeading code={code} />
        <Flex align="center" gap="3" wrap="wrap">
          <Flex align="center" gap="2" fontSize="1.6rem" fontWeight="bold" data-testid="wall-link-state" data-connected={String(sync.connected)}>
            <Shape kind={link.stale ? 'octagon' : 'check'} size="1.8rem" color={link.stale ? 'alarm.400' : 'seaglass.400'} />
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
          <Button
            size="lg"
            variant={picture ? 'solid' : 'outline'}
            colorPalette="brand"
            color="white"
            borderColor="ink.300"
            onClick={() => setPicture((p) => !p)}
            aria-pressed={picture}
            data-testid="wall-picture-toggle"
          >
            Last 10 min: {picture ? 'picture' : 'list'}
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
        <Flex role="alert" align="center" gap="4" bg="alarm.600" color="white" borderWidth="4px" borderColor="white" borderRadius="l3" px="5" py="3" data-testid="wall-stale-banner">
          <Shape kind="octagon" size="3.5rem" />
          <Box>
            <Text fontSize="2.6rem" fontWeight="black" lineHeight="1.1">
              Not connected — last update {ageWords(link.ageMs)}
            </Text>
            <Text fontSize="1.6rem" fontWeight="bold">
              Clocks keep running from the last entries this screen received; new taps will not show until the link returns.
            </Text>
          </Box>
        </Flex>
      ) : null}

      <WallFace
        code={code}
        protocol={protocol}
        state={s}
        entries={entries}
        recent={
          picture ? (
            <WallBox testId="wall-picture">
              <CodePictureView
                timeline={timeline}
                entries={entries}
                protocol={protocol}
                lastMs={WALL_PICTURE_MS}
                nowMs={nowMs}
                // A child's wall gives the doses the wide column: a smaller picture fits the other.
                scale={code.category === 'pediatric' ? 1.25 : 1.5}
                compact
                inverse
                interactive={false}
                label="The last 10 minutes of the code: compressions, rhythm checks, shocks, drugs, airway and access, ETCO2 and ROSC"
              />
            </WallBox>
          ) : undefined
        }
        arrestClock={
          <ArrestClock arrestAtMs={s.arrestAtMs} frozenAtMs={s.endedAtMs} correctedNow={clock.correctedNow} testId="wall-arrest-clock" fontSize="9rem" />
        }
      />

      <Box borderTopWidth="2px" borderColor="ink.600" pt="2" data-testid="wall-caution">
        <Text fontSize="1.25rem" fontWeight="bold">
          {REMINDER_CAUTION}
        </Text>
        <Text fontSize="1.1rem" color="ink.100" data-testid="wall-footer">
          Protocol v{code.protocolVersion ?? 1}: {protocol.edition}. Timers follow the taps. {TAPS_NOT_SENSOR}{' '}
          {clockOffsetWords(clock.offsetMs, clock.uncertaintyMs)}
        </Text>
      </Box>
    </Stack>
  );
}

export function WallHeading({ code }: { code: Code }) {
  const pediatric = code.category === 'pediatric';
  return (
    <Text as="h1" fontSize="2.6rem" fontWeight="bold" lineHeight="1.1" data-testid="wall-heading">
      {pediatric ? 'Pediatric' : 'Adult'} code · {code.location ?? 'location not set'}
    </Text>
  );
}

/**
 * What the wall shows for one moment of a code: the clocks, what is due, the last entries and,
 * for a child, the doses. Live on the wall; replayed at any moment on the review screen.
 */
export function WallFace({
  code,
  protocol,
  state: s,
  entries,
  arrestClock,
  recent,
}: {
  code: Code;
  protocol: ProtocolSettings;
  state: CodeState;
  entries: readonly LogEntry[];
  /** The live wall passes a clock read many times a second; a replay shows the state's own. */
  arrestClock?: ReactNode;
  /** Shown instead of the last entries (the wall's picture of the last 10 minutes). */
  recent?: ReactNode;
}) {
  const byId = useMemo(() => new Map(entries.map((e) => [e.id, e])), [entries]);
  const pediatric = code.category === 'pediatric';
  const rhythm = rhythmReading(s);
  const shocks = shockReading(s);
  const fraction = fractionReading(s);
  return (
    <Stack gap="3" flex="1">
      {s.status === 'ended' ? (
        <Box bg="ink.700" borderRadius="l3" px="5" py="2" data-testid="wall-ended">
          <Text fontSize="2.2rem" fontWeight="bold">
            Code ended at {formatElapsedMs((s.endedAtMs ?? s.arrestAtMs) - s.arrestAtMs)}
            {s.outcome ? `: ${OUTCOME_WORDS[s.outcome]}` : ''}
          </Text>
        </Box>
      ) : null}
      {s.categoryChange ? (
        <Box bg="signal.300" color="ink.950" borderRadius="l3" px="5" py="2" data-testid="wall-category-changed">
          <Text fontSize="2rem" fontWeight="black">
            Switched to {s.categoryChange.to === 'pediatric' ? 'pediatric' : 'adult'} at {dayjs(s.categoryChange.atMs).format('HH:mm:ss')}: doses and energies
            recalculated{code.weightKg !== null ? ` for ${formatDose(code.weightKg)} kg` : ''}
          </Text>
        </Box>
      ) : null}

      <Grid templateColumns="1.05fr 1fr 1fr" gap="3">
        <Stack gap="0" bg="ink.900" borderWidth="4px" borderColor={s.status === 'rosc' ? 'seaglass.400' : 'ink.500'} borderRadius="l3" px="5" py="3" minW="0">
          <Flex justify="space-between" align="center">
            <PanelLabel>Since arrest</PanelLabel>
            <Text fontSize="2.2rem" fontWeight="black">
              {s.status === 'ended' ? 'ENDED' : s.status === 'rosc' ? 'ROSC' : 'ARREST'}
            </Text>
          </Flex>
          {arrestClock ?? (
            <Text fontSize="9rem" fontWeight="bold" lineHeight="1" fontVariantNumeric="tabular-nums" data-testid="wall-arrest-clock">
              {formatElapsedMs(s.arrestElapsedMs)}
            </Text>
          )}
          <Text fontSize="1.9rem" fontWeight="bold">
            Arrest at {dayjs(s.arrestAtMs).format('HH:mm:ss')}
          </Text>
        </Stack>
        <ReadingBlock label="Compressions" reading={compressionReading(s)} testId="wall-compressions" />
        <ReadingBlock label="Epinephrine" reading={epinephrineReading(s)} testId="wall-epinephrine" />
      </Grid>

      <Grid templateColumns="repeat(4, minmax(0, 1fr))" gap="3">
        <FactBlock label="Rhythm" value={rhythm.value} note={rhythm.note} testId="wall-rhythm" />
        <FactBlock label="Shocks" value={shocks.value} note={`${shocks.word} · ${shocks.note}`} testId="wall-shocks" />
        <FactBlock label="Compression fraction" value={fraction.value} note={`From taps · ${fraction.note}`} testId="wall-fraction" />
        <WallBox testId="wall-drugs">
          <PanelLabel>Drugs given</PanelLabel>
          <DrugTotals totals={s.drugTotals} />
        </WallBox>
      </Grid>

      {pediatric ? (
        // A child's wall gives the doses the widest column; what is due sits above the last entries.
        <Grid templateColumns="1fr 1.3fr" gap="3" flex="1">
          <Stack gap="3" minW="0">
            <WallReminders state={s} max={3} />
            {recent ?? (
              <WallBox testId="wall-recent">
                <PanelLabel>Last entries</PanelLabel>
                <RecentList s={s} protocol={protocol} byId={byId} />
              </WallBox>
            )}
          </Stack>
          <PediatricDosing code={code} s={s} />
        </Grid>
      ) : (
        <Grid templateColumns="1.4fr 1fr" gap="3" flex="1">
          {recent ?? (
            <WallBox testId="wall-recent">
              <PanelLabel>Last entries</PanelLabel>
              <RecentList s={s} protocol={protocol} byId={byId} />
            </WallBox>
          )}
          <WallReminders state={s} />
        </Grid>
      )}
    </Stack>
  );
}

const SEVERITY_TONE: Record<Reminder['severity'], 'calm' | 'due' | 'overdue'> = { urgent: 'overdue', attention: 'due', info: 'calm' };
const SEVERITY_SHAPE: Record<Reminder['severity'], 'octagon' | 'triangle' | 'ring'> = { urgent: 'octagon', attention: 'triangle', info: 'ring' };

/** What is due now, in words and shapes, and the doses the team should look at again. */
function WallReminders({ state: s, max = 5 }: { state: CodeState; max?: number }) {
  const items = [
    ...(s.categoryWarning ? [{ key: 'category', tone: 'due' as const, shape: 'triangle' as const, word: 'CHECK', text: s.categoryWarning }] : []),
    ...s.reminders.map((r) => ({ key: r.kind, tone: SEVERITY_TONE[r.severity], shape: SEVERITY_SHAPE[r.severity], word: REMINDER_WORDS[r.state], text: r.message })),
    ...s.flaggedDoses.slice(0, 3).map((d) => ({ key: d.id, tone: 'due' as const, shape: 'triangle' as const, word: 'DOSE', text: flaggedDoseText(d) })),
  ];
  return (
    <WallBox testId="wall-reminders">
      <PanelLabel>Due now</PanelLabel>
      {items.length === 0 ? (
        <Text fontSize="1.8rem" fontWeight="bold">
          Nothing due
        </Text>
      ) : (
        <Stack gap="1.5">
          {items.slice(0, max).map((i) => {
            const c = WALL_TONES[i.tone];
            return (
              <Flex key={i.key} bg={c.bg} color={c.fg} borderRadius="l2" px="3" py="1" gap="3" align="center" data-testid={`wall-reminder-${i.key}`}>
                <Shape kind={i.shape} size="2rem" />
                <Text fontSize="1.5rem" fontWeight="black" flexShrink={0}>
                  {i.word}
                </Text>
                <Text fontSize="1.4rem" fontWeight="bold" lineHeight="1.2">
                  {i.text}
                </Text>
              </Flex>
            );
          })}
        </Stack>
      )}
    </WallBox>
  );
}

function DrugTotals({ totals }: { totals: readonly DrugAggregate[] }) {
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
            {drugTotalText(t)} ×{t.doseCount}
          </Text>
        </Flex>
      ))}
      {totals.length > 4 ? <Text fontSize="1.4rem">and {totals.length - 4} more</Text> : null}
    </Stack>
  );
}

function RecentList({ s, protocol, byId }: { s: CodeState; protocol: ProtocolSettings; byId: ReadonlyMap<string, LogEntry> }) {
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
            fontSize={i === 0 ? '2.6rem' : '2rem'}
            fontWeight={i === 0 ? 'black' : 'bold'}
            lineHeight="1.3"
            opacity={i === 0 ? 1 : 0.92}
            data-testid={i === 0 ? 'wall-last-entry' : 'wall-entry'}
            data-entry-id={e.id}
          >
            <Text as="span" minW="9rem" fontVariantNumeric="tabular-nums" flexShrink={0}>
              +{formatElapsedMs(at - s.arrestAtMs)}
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

function PediatricDosing({ code, s }: { code: Code; s: CodeState }) {
  const sheet = s.sheet;
  return (
    <Box bg="ink.900" borderWidth="4px" borderColor="signal.300" borderRadius="l3" px="4" py="3" minW="0" data-testid="wall-dosing">
      <Flex justify="space-between" align="baseline" gap="3">
        <PanelLabel>Weight-based doses</PanelLabel>
        <Text fontSize="2.2rem" fontWeight="black" data-testid="wall-weight">
          {code.weightKg !== null ? `${formatDose(code.weightKg)} kg${code.weightSource === 'estimated-age' ? ' (ESTIMATE)' : ''}` : 'Weight needed'}
        </Text>
      </Flex>
      <Flex align="center" gap="2" color="signal.200" fontSize="1.3rem" fontWeight="bold" my="1">
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
              const next = s.nextDoses[d.key];
              const line = next?.line;
              if (!line) return null;
              return (
                <Text key={d.key} data-testid={`wall-dose-${d.key}`} fontSize="1.5rem" fontWeight="bold" lineHeight="1.2">
                  {next.limit ? `${d.label}: ${next.limit.message}` : `${d.label} dose ${line.doseNumber}: ${line.display}${line.volumeText ? ` · ${line.volumeText}` : ''}`}
                  <Text as="span" fontSize="1.1rem" fontWeight="normal" color="ink.100">
                    {' '}
                    ({line.formula}
                    {line.capNote ? `; ${line.capNote}` : ''})
                  </Text>
                </Text>
              );
            })}
          {(['defibrillation', 'cardioversion'] as const).map((mode) => {
            const step = s.nextEnergy[mode];
            if (!step) return null;
            return (
              <Text key={mode} data-testid={`wall-energy-${mode}`} fontSize="1.5rem" fontWeight="bold" lineHeight="1.2">
                {mode === 'defibrillation' ? 'Shock (not synchronised)' : 'SYNCHRONISED cardioversion'}: {step.display}
                <Text as="span" fontSize="1.1rem" fontWeight="normal" color="ink.100">
                  {' '}
                  ({step.formula}
                  {step.capNote ? `; ${step.capNote}` : ''})
                </Text>
              </Text>
            );
          })}
          <Text fontSize="1.05rem" color="ink.100">
            Check concentration and units (mg vs mcg, 0.1 vs 1 mg/mL). The defibrillator maker&apos;s settings come first; this does not
            set the device.
          </Text>
        </Stack>
      )}
    </Box>
  );
}
