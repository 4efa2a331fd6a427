import { Alert, Box, Button, Flex, Grid, Heading, Stack, Text } from '@chakra-ui/react';
import {
  flaggedDoseText,
  formatElapsedMs,
  REMINDER_CAUTION as CORE_REMINDER_CAUTION,
  stateAt,
  type Code,
  type EffectiveEntry,
  type NewEntry,
  type ProtocolSettings,
} from '@steadyhand/shared';
import dayjs from 'dayjs';
import { lazy, Suspense, useCallback, useMemo, useState } from 'react';
import { Link as RouterLink } from 'react-router';
import { paths } from '../../../config/paths';
import type { EntryFields } from '../../../lib/live/entry-build';
import type { LiveCode } from '../../../lib/live/use-live-code';
import { describeEntry, formatDose, OUTCOME_WORDS } from '../../../lib/live/entry-words';
import { lastMoment, useCodeTimeline } from '../../../lib/live/use-code-timeline';
import { CprGroup } from './cpr-group';
import { DrugGroup, type DrugTapPlan } from './drug-group';
import { AccessGroup, AirwayGroup, Etco2Group, EventGroup } from './more-groups';
import { RecentEntries } from './recent-entries';
import { RhythmGroup } from './rhythm-group';
import { Shape } from '../../../components/ui/shapes';
import { ShockGroup } from './shock-group';
import { StatusStrip } from './status-strip';
import { UNDO_WINDOW_MS, UndoBar, type LastTap } from './undo-bar';

// Loaded on first opening, so the pad's first load stays small.
const CodeDetailsSheet = lazy(() => import('./code-details-sheet'));
const DoseEditor = lazy(() => import('./editors').then((m) => ({ default: m.DoseEditor })));
const NumberEditor = lazy(() => import('./editors').then((m) => ({ default: m.NumberEditor })));
const NoteEditor = lazy(() => import('./editors').then((m) => ({ default: m.NoteEditor })));

export const REMINDER_CAUTION = CORE_REMINDER_CAUTION;
export const UNDO_REASON = 'undone on the pad within 5 s';
export const AMEND_REASON = 'dose corrected after tap';
const DOSE_EDIT_WINDOW_MS = 30_000;
const OTHER_DRUG = 'Other drug (name to complete)';

type Editor =
  | { kind: 'amend-dose'; entry: Extract<NewEntry, { kind: 'drug' }> }
  | { kind: 'new-dose'; plan: DrugTapPlan }
  | { kind: 'other-drug' }
  | { kind: 'energy' }
  | { kind: 'etco2' }
  | { kind: 'note' };

interface RecorderPadProps {
  live: LiveCode;
  code: Code;
  protocol: ProtocolSettings;
  canWrite: boolean;
  /** Why this person sees the code read-only. */
  readOnlyReason?: string;
}

/**
 * The recorder pad: the strip of clocks on top, the bedside jobs as big buttons, the latest
 * entries beside (landscape) or below (portrait). Every tap records at once; Undo follows.
 */
export function RecorderPad({ live, code, protocol, canWrite, readOnlyReason }: RecorderPadProps) {
  const [lastTap, setLastTap] = useState<LastTap | null>(null);
  const [editor, setEditor] = useState<Editor | null>(null);
  const [tapError, setTapError] = useState<string | null>(null);
  const [synchronized, setSynchronized] = useState(false);
  const [detailsOpen, setDetailsOpen] = useState(false);
  const { record, entries, clock } = live;

  // The log folded once per change; the strip reads its moment from it every second.
  const timeline = useCodeTimeline(code, protocol, entries);
  const effective = timeline.all;
  const sheet = timeline.sheet;
  // Counts and the next dose or energy, with every entry so far.
  const snapshot = useMemo(() => stateAt(timeline, lastMoment(timeline)), [timeline]);
  const arrestAtMs = Date.parse(code.arrestAt);
  const pediatric = code.category === 'pediatric';

  const tap = useCallback(
    (fields: EntryFields) => {
      if (!canWrite) return;
      record(fields)
        .then((entry) => {
          setTapError(null);
          // The synchronised switch goes back to off after every shock, so the next one is not synchronised by mistake.
          if (entry.kind === 'shock') setSynchronized(false);
          if (entry.kind === 'void' || entry.kind === 'amend') return;
          const now = Date.now();
          setLastTap({
            entry,
            undoUntil: now + UNDO_WINDOW_MS,
            editUntil: now + DOSE_EDIT_WINDOW_MS,
          });
        })
        .catch((err: unknown) => {
          setTapError(err instanceof Error ? err.message : String(err));
        });
    },
    [canWrite, record],
  );

  const undo = () => {
    if (!lastTap || Date.now() > lastTap.undoUntil) return;
    tap({ kind: 'void', target: lastTap.entry.id, reason: UNDO_REASON });
    setLastTap(null);
  };

  const voidEntry = (entry: EffectiveEntry, reason: string) =>
    tap({ kind: 'void', target: entry.id, reason });

  // Stable callbacks: the button groups are memoised, so a tap re-renders the list, not every button.
  const onDrug = useCallback(
    (plan: DrugTapPlan) => {
      if (!plan.dose) {
        setEditor({ kind: 'new-dose', plan });
        return;
      }
      tap({
        kind: 'drug',
        drug: plan.drug.key,
        dose: plan.dose.amount,
        unit: plan.dose.unit,
        route: plan.drug.route,
      });
    },
    [tap],
  );
  const onOtherEnergy = useCallback(() => setEditor({ kind: 'energy' }), []);
  const onOtherDrug = useCallback(() => setEditor({ kind: 'other-drug' }), []);
  const onNote = useCallback(() => setEditor({ kind: 'note' }), []);
  const onOtherEtco2 = useCallback(() => setEditor({ kind: 'etco2' }), []);


  const nextPedStep = synchronized ? snapshot.nextEnergy.cardioversion : snapshot.nextEnergy.defibrillation;
  const noWrite = !canWrite;
  const failedById = new Map(entries.map((e) => [e.id, e]));

  const alerts = (
    <>
      {snapshot.categoryChange ? (
        <Box bg="signal.100" borderWidth="2px" borderColor="signal.600" borderRadius="l3" px="3" py="1" data-testid="category-changed">
          <Text textStyle="sm" fontWeight="bold">
            Switched to {snapshot.categoryChange.to === 'pediatric' ? 'a pediatric' : 'an adult'} code at{' '}
            {dayjs(snapshot.categoryChange.atMs).format('HH:mm:ss')}: doses and energies recalculated
            {code.weightKg !== null ? ` for ${code.weightKg} kg` : ''}. Doses given before are checked against the new sheet.
          </Text>
        </Box>
      ) : null}

      {live.sync.alarm ? (
        <Alert.Root status="error" variant="solid" role="alert" borderRadius="l3" py="2" data-testid="sync-alarm">
          <Shape kind="octagon" size="2em" />
          <Alert.Content>
            <Alert.Title textStyle="lg" fontWeight="bold">
              {live.sync.waiting} {live.sync.waiting === 1 ? 'entry has' : 'entries have'} waited
              over a minute for the server
            </Alert.Title>
            <Alert.Description textStyle="sm">
              Keep recording: every tap is kept on this tablet. Check the Wi-Fi; do not sign out or
              clear this browser.
            </Alert.Description>
          </Alert.Content>
        </Alert.Root>
      ) : null}

      {live.failed.length > 0 ? (
        <Alert.Root status="error" role="alert" borderRadius="l3" py="2" data-testid="sync-failed">
          <Shape kind="cross" size="2em" />
          <Alert.Content>
            <Alert.Title textStyle="md" fontWeight="bold">
              The server refused{' '}
              {live.failed.length === 1 ? 'one entry' : `${live.failed.length} entries`}: not in the
              record yet
            </Alert.Title>
            <Stack gap="1" mt="1">
              {live.failed.map((f) => (
                <Flex key={f.id} align="center" gap="2" wrap="wrap">
                  <Text textStyle="sm" fontWeight="bold">
                    {describeEntry(f.entry, protocol, failedById)}
                  </Text>
                  <Text textStyle="xs">({f.error})</Text>
                  <Button size="sm" minH="12" variant="outline" bg="white" onClick={() => void live.retryFailed(f.id)}>
                    Send again
                  </Button>
                </Flex>
              ))}
            </Stack>
          </Alert.Content>
        </Alert.Root>
      ) : null}

      {tapError || live.unkept.length > 0 ? (
        <Alert.Root status="error" variant="solid" role="alert" borderRadius="l3" py="2" data-testid="tap-not-kept">
          <Shape kind="cross" size="2em" />
          <Alert.Content>
            <Alert.Title fontWeight="bold">
              {live.unkept.length > 1 ? `${live.unkept.length} taps were` : 'That tap was'} NOT saved on this tablet
            </Alert.Title>
            <Alert.Description>
              {live.unkept.map((u) => `${describeEntry(u.entry, protocol)} (${u.error})`).join('; ') || tapError} Write it on
              paper and tell the team leader.
            </Alert.Description>
          </Alert.Content>
        </Alert.Root>
      ) : null}

      {snapshot.status === 'ended' ? (
        <Flex bg="ink.100" borderRadius="l3" px="3" py="1" gap="3" align="center" wrap="wrap" data-testid="ended-banner">
          <Text textStyle="md" fontWeight="bold" flex="1" minW="12rem">
            Code ended at {formatElapsedMs((snapshot.endedAtMs ?? arrestAtMs) - arrestAtMs)}
            {snapshot.outcome ? `: ${OUTCOME_WORDS[snapshot.outcome]}` : ''}. Late entries can still
            be added.
          </Text>
          <Button asChild colorPalette="brand" minH="12" data-testid="ended-review">
            <RouterLink to={paths.codes.review.getHref(code.id)}>Review and sign the record</RouterLink>
          </Button>
        </Flex>
      ) : null}

      {noWrite ? (
        <Box bg="seaglass.50" borderWidth="2px" borderColor="seaglass.600" borderRadius="l3" px="3" py="2" data-testid="read-only-notice">
          <Text textStyle="lg" fontWeight="bold">
            Watching this code
          </Text>
          <Text>
            {readOnlyReason ?? 'Only a recorder or a team leader can add entries.'} Each entry
            appears here as it is recorded.
          </Text>
        </Box>
      ) : null}
    </>
  );

  const weightWords =
    code.weightKg !== null
      ? `${formatDose(code.weightKg)} kg${code.weightSource === 'estimated-age' ? ' (estimate)' : ''}`
      : 'weight not set';

  return (
    <Flex
      direction="column"
      gap="2"
      h={{ base: 'auto', md: 'full' }}
      pb={{ base: '28', md: '0' }}
      data-testid="recorder-pad"
      data-code-id={code.id}
    >
      {alerts}

      <Grid
        flex="1"
        minH="0"
        gap="2"
        templateColumns={{ base: 'minmax(0, 1fr)', lg: noWrite ? 'minmax(0, 1fr)' : 'minmax(0, 1fr) 19rem' }}
        templateRows={{
          base: 'auto',
          md: noWrite ? 'auto auto minmax(0, 1fr)' : 'auto auto auto minmax(0, 1fr)',
          lg: 'auto auto minmax(0, 1fr)',
        }}
        // Landscape: the bedside jobs on the left, what to read (code, clocks, entries) on the right.
        templateAreas={{
          base: noWrite ? '"head" "status" "side"' : '"head" "status" "main" "side"',
          lg: noWrite ? '"head" "status" "side"' : '"main head" "main status" "main side"',
        }}
      >
        <Flex gridArea="head" align="center" justify="space-between" wrap="wrap" gap="2" minW="0">
          <Flex align="center" gap="2" wrap="wrap" minW="0">
            <Heading as="h1" textStyle="lg" fontWeight="bold" data-testid="record-heading">
              {pediatric ? 'Pediatric' : 'Adult'} code
            </Heading>
            <Box
              as="span"
              px="2"
              py="0.5"
              borderRadius="full"
              borderWidth="2px"
              borderColor={code.weightKg === null && pediatric ? 'alarm.600' : 'ink.700'}
              fontWeight="bold"
              textStyle="sm"
              data-testid="header-weight"
            >
              {weightWords}
            </Box>
            <Text as="span" textStyle="sm" color="ink.700" truncate maxW="16rem">
              {code.location ?? 'place not set'}
            </Text>
          </Flex>
          <Flex align="center" gap="2">
            <Button
              minH="12"
              variant="outline"
              bg="white"
              data-testid="pad-details"
              aria-expanded={detailsOpen}
              onClick={() => setDetailsOpen(true)}
            >
              Code details
            </Button>
            <Button asChild minH="12" variant="outline" bg="white" data-testid="pad-wall-link">
              <RouterLink to={paths.codes.wall.getHref(code.id)}>Wall</RouterLink>
            </Button>
          </Flex>
        </Flex>
        <Box gridArea="status" minW="0">
          <StatusStrip timeline={timeline} sync={live.sync} correctedNow={clock.correctedNow} />
        </Box>

        {noWrite ? null : (
          <Flex gridArea="main" direction="column" gap="2" minW="0" data-testid="pad-actions">
            <Grid templateColumns={{ base: 'minmax(0, 1fr)', sm: 'repeat(2, minmax(0, 1fr))', md: 'repeat(3, minmax(0, 1fr))' }} gap="2">
              <CprGroup running={snapshot.compressions.running} onTap={tap} disabled={noWrite} />
              <RhythmGroup onTap={tap} disabled={noWrite} />
              <ShockGroup
                onTap={tap}
                onOtherEnergy={onOtherEnergy}
                synchronized={synchronized}
                onSynchronized={setSynchronized}
                disabled={noWrite}
                pediatric={pediatric}
                sheet={sheet}
                presets={protocol.shockPresetsJoules}
                defaultJoules={protocol.defaultShockJoules}
                nextStep={nextPedStep}
              />
            </Grid>
            <DrugGroup
              protocol={protocol}
              sheet={sheet}
              nextDoses={snapshot.nextDoses}
              totals={snapshot.drugTotals}
              pediatric={pediatric}
              disabled={noWrite}
              onDrug={onDrug}
              onOtherDrug={onOtherDrug}
            />
            <Grid
              templateColumns={{ base: 'minmax(0, 1fr)', sm: 'repeat(2, minmax(0, 1fr))', md: '1.1fr 1.2fr 0.7fr 1.2fr' }}
              gap="2"
            >
              <EventGroup onTap={tap} onNote={onNote} disabled={noWrite} />
              <AirwayGroup onTap={tap} disabled={noWrite} />
              <AccessGroup onTap={tap} disabled={noWrite} />
              <Etco2Group onTap={tap} onOther={onOtherEtco2} disabled={noWrite} />
            </Grid>
          </Flex>
        )}

        <Flex gridArea="side" direction="column" gap="2" minW="0" minH="0">
          {noWrite ? null : (
            // On a phone the list is far below the buttons: Undo floats at the bottom edge there.
            <Box
              position={{ base: 'fixed', md: 'static' }}
              bottom={{ base: '0', md: 'auto' }}
              left={{ base: '0', md: 'auto' }}
              right={{ base: '0', md: 'auto' }}
              zIndex={{ base: 'docked', md: 'auto' }}
              p={{ base: '2', md: '0' }}
              flexShrink={0}
            >
            <UndoBar
              tap={lastTap}
              protocol={protocol}
              onUndo={undo}
              onChangeDose={
                lastTap?.entry.kind === 'drug'
                  ? () => lastTap.entry.kind === 'drug' && setEditor({ kind: 'amend-dose', entry: lastTap.entry })
                  : undefined
              }
            />
            </Box>
          )}
          {snapshot.flaggedDoses.length > 0 ? (
            <Box bg="signal.50" borderWidth="2px" borderColor="signal.500" borderRadius="l2" px="2" py="1" data-testid="flagged-doses">
              <Text textStyle="xs" fontWeight="black">
                DOSES TO CHECK
              </Text>
              {snapshot.flaggedDoses.map((d) => (
                <Text key={d.id} textStyle="xs" fontWeight="bold">
                  {flaggedDoseText(d)}
                </Text>
              ))}
            </Box>
          ) : null}
          <RecentEntries
            entries={effective}
            all={entries}
            stageOf={live.stageOf}
            unkept={live.unkept}
            arrestAtMs={arrestAtMs}
            protocol={protocol}
            count={noWrite ? 20 : 12}
            onVoid={noWrite ? undefined : voidEntry}
          />
          <Box borderTopWidth="1px" borderColor="ink.200" pt="1" flexShrink={0} data-testid="reminder-caution">
            <Text textStyle="xs" fontWeight="bold" lineHeight="1.3">
              {REMINDER_CAUTION}
            </Text>
            <Text textStyle="xs" color="ink.700" lineHeight="1.3">
              <span id="shock-caution">Shocks are recorded as given; the pad does not set the defibrillator.</span>{' '}
              <span id="etco2-caution">ETCO2 is information only, never a reason on its own to stop.</span>
            </Text>
          </Box>
        </Flex>
      </Grid>

      {detailsOpen ? (
        <Suspense fallback={null}>
          <CodeDetailsSheet
            code={code}
            canWrite={canWrite}
            onSaved={live.setCode}
            onClose={() => setDetailsOpen(false)}
            clock={clock}
            protocol={protocol}
            sheet={sheet}
          />
        </Suspense>
      ) : null}

      <Suspense fallback={null}>
      {editor?.kind === 'amend-dose' ? (
        <DoseEditor
          title={`Change ${describeEntry(editor.entry, protocol)}`}
          initialDose={editor.entry.dose}
          initialRoute={editor.entry.route}
          unit={editor.entry.unit}
          saveLabel="Save correction"
          note={
            <Text textStyle="sm">
              The original tap stays in the record; this adds a correction ({AMEND_REASON}).
            </Text>
          }
          onCancel={() => setEditor(null)}
          onSave={(dose, route) => {
            const target = editor.entry;
            const changes: Record<string, unknown> = {};
            if (dose !== target.dose) changes.dose = dose;
            if (route !== target.route) changes.route = route;
            if (Object.keys(changes).length > 0)
              tap({ kind: 'amend', target: target.id, changes, reason: AMEND_REASON });
            setEditor(null);
            setLastTap(null);
          }}
        />
      ) : null}
      {editor?.kind === 'new-dose' ? (
        <DoseEditor
          title={`${editor.plan.drug.label}: dose`}
          initialDose={null}
          initialRoute={editor.plan.drug.route}
          unit={editor.plan.drug.unit}
          saveLabel="Record dose"
          note={
            pediatric ? (
              <Text fontWeight="bold">
                Double-check every weight-based dose with a second person.
              </Text>
            ) : undefined
          }
          onCancel={() => setEditor(null)}
          onSave={(dose, route, unit) => {
            tap({ kind: 'drug', drug: editor.plan.drug.key, dose, unit, route });
            setEditor(null);
          }}
        />
      ) : null}
      {editor?.kind === 'other-drug' ? (
        <DoseEditor
          title="Other drug: dose"
          initialDose={null}
          initialRoute="iv"
          unit="mg"
          chooseUnit
          saveLabel="Record dose"
          note={
            <Text textStyle="sm">
              The drug&apos;s name is completed at review, so no typing is needed now.
            </Text>
          }
          onCancel={() => setEditor(null)}
          onSave={(dose, route, unit) => {
            tap({ kind: 'drug', drug: OTHER_DRUG, dose, unit, route });
            setEditor(null);
          }}
        />
      ) : null}
      {editor?.kind === 'energy' ? (
        <NumberEditor
          title={synchronized ? 'Synchronised shock: energy' : 'Shock: energy'}
          unit="J"
          min={1}
          max={400}
          saveLabel={synchronized ? 'Record synchronised shock' : 'Record shock'}
          onCancel={() => setEditor(null)}
          onSave={(joules) => {
            tap({ kind: 'shock', joules, synchronized });
            setEditor(null);
          }}
        />
      ) : null}
      {editor?.kind === 'etco2' ? (
        <NumberEditor
          title="ETCO2"
          unit="mmHg"
          min={0}
          max={200}
          saveLabel="Record ETCO2"
          onCancel={() => setEditor(null)}
          onSave={(mmHg) => {
            tap({ kind: 'etco2', mmHg });
            setEditor(null);
          }}
        />
      ) : null}
      {editor?.kind === 'note' ? (
        <NoteEditor
          onCancel={() => setEditor(null)}
          onSave={(text) => {
            tap({ kind: 'note', text });
            setEditor(null);
          }}
        />
      ) : null}
      </Suspense>
    </Flex>
  );
}
