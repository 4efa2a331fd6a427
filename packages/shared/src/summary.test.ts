import { describe, expect, it } from 'vitest';
import type { LogEntry } from './effective-log.js';
import { stateAt } from './code-state.js';
import { foldLog } from './timeline.js';
import { DEFAULT_PROTOCOL, type ProtocolSettings } from './protocol.js';
import {
  PRE_SHOCK_PAUSE_TARGET_SECONDS,
  SUMMARY_DEFINITIONS,
  summarizeLog,
  type CodeSummary,
} from './summary.js';

// Check values and their sources: shared/reference/clinical-reference.md (sections 1b, 3, 4, 6).

const settings: ProtocolSettings = DEFAULT_PROTOCOL;

let nextId = 1;
/** Valid v4-shaped UUIDs, so amendments (schema-checked) apply to the fixtures. */
const uuid = () => `00000000-0000-4000-8000-${(nextId++).toString().padStart(12, '0')}`;

/** A fixture clock: seconds after a fixed base time. */
const BASE_MS = Date.parse('2026-03-04T07:00:00.000Z');
const t = (s: number) => new Date(BASE_MS + s * 1000).toISOString();
/** Clock time on the fixture day, "07:42:10" → ISO. */
const clock = (hms: string) => `2026-03-04T${hms}.000Z`;

type NoBase<T> = T extends unknown ? Omit<T, 'id' | 'at'> : never;
const entry = (at: string, fields: NoBase<LogEntry>): LogEntry =>
  ({ id: uuid(), at, ...fields });

const start = (at: string) => entry(at, { kind: 'cpr', action: 'start' });
const stop = (at: string, reason?: 'rhythm-check' | 'shock' | 'airway' | 'rosc' | 'other') =>
  entry(at, { kind: 'cpr', action: 'stop', ...(reason ? { reason } : {}) });
const rhythm = (at: string, r: 'vf' | 'pvt' | 'pea' | 'asystole' | 'organized' | 'other') =>
  entry(at, { kind: 'rhythm', rhythm: r, pulse: false });
const shock = (at: string, joules = 200, synchronized = false) =>
  entry(at, { kind: 'shock', joules, synchronized });
const drug = (
  at: string,
  name: string,
  dose: number,
  unit: 'mg' | 'ug' | 'g' | 'meq' | 'mL' = 'mg',
) => entry(at, { kind: 'drug', drug: name, dose, unit, route: 'iv' });
const rosc = (at: string) => entry(at, { kind: 'rosc' });
const rearrest = (at: string) => entry(at, { kind: 'rearrest' });
const end = (at: string, outcome: 'sustained-rosc' | 'died' | 'transferred' | 'other' = 'other') =>
  entry(at, { kind: 'end', outcome });

const code = (arrestAt: string, endedAt: string | null = null) => ({
  arrestAt,
  endedAt,
  category: 'adult' as const,
  weightKg: null,
});

/** The core's three steps as the record uses them: fold the log, then summarize. */
const summarizeCode = (input: { code: ReturnType<typeof code>; entries: LogEntry[]; settings: ProtocolSettings; asOf?: string }): CodeSummary =>
  summarizeLog(input.code, input.entries, input.settings, input.asOf ? { asOfMs: Date.parse(input.asOf) } : {});

const summarize = (
  arrestAt: string,
  entries: LogEntry[],
  s: ProtocolSettings = settings,
): CodeSummary => summarizeCode({ code: code(arrestAt), entries, settings: s });

describe('summarizeCode: the brief demo code', () => {
  // Brief, "A code, start to finish": 07:42:10 arrest; compressions 07:42:25; first rhythm
  // check VF 07:43:40; shock 200 J; epinephrine 1 mg IV 07:47:55; ROSC 07:58:30; ended 08:05.
  // Expected intervals are derived arithmetic from those clock times, not published values.
  const arrest = clock('07:42:10');
  const entries = [
    start(clock('07:42:25')),
    stop(clock('07:43:38'), 'rhythm-check'),
    rhythm(clock('07:43:40'), 'vf'),
    shock(clock('07:43:45'), 200),
    start(clock('07:43:47')),
    drug(clock('07:47:55'), 'epinephrine', 1),
    stop(clock('07:58:25'), 'rosc'),
    rosc(clock('07:58:30')),
    end(clock('08:05:00'), 'transferred'),
  ];
  const s = summarize(arrest, entries);
  const secs = (hms: string) => (Date.parse(clock(hms)) - Date.parse(arrest)) / 1000;

  it('gives the Utstein intervals from arrest recognition', () => {
    expect(secs('07:42:25')).toBe(15); // the fixture says what the brief says
    expect(s.intervals.arrestToFirstCompressions).toBe(15);
    expect(s.intervals.arrestToFirstRhythmAnalysis).toBe(90);
    expect(s.intervals.arrestToFirstShock).toBe(secs('07:43:45'));
    expect(s.intervals.arrestToFirstEpinephrine).toBe(345); // 5 min 45 s
    expect(s.intervals.arrestToFirstRosc).toBe(980); // 16 min 20 s
    expect(s.intervals.arrestToEnd).toBe(22 * 60 + 50);
    expect(s.durationSeconds).toBe(22 * 60 + 50);
  });

  it('gives the time points as ISO strings', () => {
    expect(s.times).toEqual({
      arrestAt: clock('07:42:10'),
      firstCompressionsAt: clock('07:42:25'),
      firstRhythmAnalysisAt: clock('07:43:40'),
      firstShockAt: clock('07:43:45'),
      firstEpinephrineAt: clock('07:47:55'),
      firstRoscAt: clock('07:58:30'),
      endedAt: clock('08:05:00'),
    });
  });

  it('records VF as a shockable first rhythm, one 200 J shock and ROSC at the end', () => {
    expect(s.firstRhythm).toBe('vf');
    expect(s.firstRhythmShockable).toBe(true);
    expect(s.shocks).toHaveLength(1);
    expect(s.shocks[0]).toMatchObject({ joules: 200, synchronized: false, at: clock('07:43:45') });
    expect(s.anyRosc).toBe(true);
    expect(s.roscAtEnd).toBe(true);
    // 6 min 30 s of ROSC when the code ended (care handed over): any ROSC yes; whether it was
    // sustained for 20 min (Utstein 2004 update, Jacobs et al.; clinical sheet §4, secondary)
    // could not be observed, so neither yes nor no.
    expect(s.roscPeriods).toEqual([
      expect.objectContaining({ seconds: 6 * 60 + 30, endedBy: 'end', sustained: false }),
    ]);
    expect(s.sustainedRosc).toBeNull();
    expect(s.sustainedRoscText).toBe('not observed: handed over after 6 min of ROSC');
    expect(s.outcome).toBe('transferred');
  });

  it('measures compression fraction up to ROSC', () => {
    const compressing = secs('07:43:38') - secs('07:42:25') + (secs('07:58:25') - secs('07:43:47'));
    const window = secs('07:58:30') - secs('07:42:25');
    expect(s.compressionSeconds).toBe(compressing);
    expect(s.compressionWindowSeconds).toBe(window);
    expect(s.compressionFraction).toBeCloseTo(compressing / window, 10);
    expect(s.pauses.map((p) => [p.seconds, p.reason, p.endedBy])).toEqual([
      [9, 'rhythm-check', 'compressions'],
      [5, 'rosc', 'rosc'],
    ]);
  });
});

describe('summarizeCode: compression fraction and pauses', () => {
  // CCF fixture (clinical sheet section 6, derived): 780 s of compressions in 1,000 s of
  // arrest time, ROSC excluded, gives 78% (same value as the Vestergaard 2021 median CCF,
  // Open Access Emerg Med 2021). CCF formula: compression time / arrest time with ROSC left out
  // (sheet section 3; formula confirmed secondary, ROSC exclusion from memory).
  // Times are seconds after the first compression; arrest recognised 15 s before.
  const T0 = 100;
  const at = (s: number) => t(T0 + s);
  const compressing: [number, number][] = [
    [0, 120],
    [130, 250],
    [350, 470],
    [530, 600],
    [612, 700],
    [1338, 1600], // still running when the code ends at 1600: stops at the end
  ];
  const roscSpan: [number, number] = [710, 1310]; // 10 min, then rearrest
  const entries = [
    start(at(0)),
    stop(at(120), 'rhythm-check'),
    rhythm(at(121), 'vf'),
    shock(at(125), 200),
    start(at(130)),
    stop(at(250), 'other'),
    start(at(350)),
    stop(at(470), 'rhythm-check'),
    start(at(530)),
    stop(at(600), 'airway'),
    start(at(612)),
    stop(at(700), 'rosc'),
    rosc(at(roscSpan[0])),
    rearrest(at(roscSpan[1])),
    start(at(1338)),
    end(at(1600), 'died'),
  ];
  const s = summarize(t(T0 - 15), entries);
  const expectedCompression = compressing.reduce((sum, [a, b]) => sum + (b - a), 0);
  const expectedWindow = 1600 - 0 - (roscSpan[1] - roscSpan[0]);

  it('gives 78% for 780 s of compressions in 1,000 s of arrest time', () => {
    expect(expectedCompression).toBe(780);
    expect(expectedWindow).toBe(1000);
    expect(s.compressionSeconds).toBe(expectedCompression);
    expect(s.compressionWindowSeconds).toBe(expectedWindow);
    expect(s.compressionFraction).toBe(0.78);
  });

  it('lists every pause, and compressions + pauses fill the window', () => {
    expect(
      s.pauses.map((p) => [p.startAt, p.endAt, p.seconds, p.startedBy, p.reason, p.endedBy]),
    ).toEqual([
      [at(120), at(130), 10, 'cpr-stop', 'rhythm-check', 'compressions'],
      [at(250), at(350), 100, 'cpr-stop', 'other', 'compressions'],
      [at(470), at(530), 60, 'cpr-stop', 'rhythm-check', 'compressions'],
      [at(600), at(612), 12, 'cpr-stop', 'airway', 'compressions'],
      [at(700), at(710), 10, 'cpr-stop', 'rosc', 'rosc'],
      [at(1310), at(1338), 28, 'rearrest', null, 'compressions'],
    ]);
    const pauseTotal = s.pauses.reduce((sum, p) => sum + p.seconds, 0);
    expect(pauseTotal + s.compressionSeconds).toBe(s.compressionWindowSeconds);
  });

  it('flags pauses over 10 s and finds the longest', () => {
    // AHA "BLS Dos and Don'ts of Adult High-Quality CPR" table: do not pause compressions for
    // more than 10 s (sheet section 1b, confirmed primary). Exactly 10 s is not "more than".
    expect(settings.pauseWarningSeconds).toBe(10);
    expect(s.longPauses.map((p) => p.seconds)).toEqual([100, 60, 12, 28]);
    expect(s.pauses.filter((p) => p.seconds === 10).every((p) => !p.overWarning)).toBe(true);
    expect(s.longestPause?.seconds).toBe(100);
    expect(s.longestPause?.startAt).toBe(at(250));
  });

  it('marks the pause holding a shock as pre-shock and splits it at the shock', () => {
    const preShock = s.pauses.filter((p) => p.preShock);
    expect(preShock).toHaveLength(1);
    expect(preShock[0]?.shockIds).toEqual([s.shocks[0]?.id]);
    expect(s.shocks[0]).toMatchObject({
      preShockPauseSeconds: 125 - 120,
      postShockPauseSeconds: 130 - 125,
      periShockPauseSeconds: 130 - 120,
    });
  });

  it('excludes ROSC from the denominator and ends ROSC at the rearrest', () => {
    expect(s.roscPeriods).toEqual([
      {
        startAt: at(710),
        endAt: at(1310),
        seconds: 600,
        endedBy: 'rearrest',
        sustained: false,
      },
    ]);
    expect(s.roscAtEnd).toBe(false);
    expect(s.outcome).toBe('died');
  });

  it('agrees with the live screens on compression time and fraction at the end', () => {
    const live = stateAt(foldLog(code(t(T0 - 15)), entries, settings), Date.parse(at(1600)) + 60_000);
    expect(live.compressions.compressionMs / 1000).toBe(s.compressionSeconds);
    expect(live.compressions.arrestWindowMs / 1000).toBe(s.compressionWindowSeconds);
    expect(live.compressions.fraction).toBe(s.compressionFraction);
  });

  it('gives the same summary whatever order the entries arrive in', () => {
    const shuffled = [...entries].reverse();
    const mid = shuffled.splice(5, 4);
    shuffled.push(...mid);
    expect(summarize(t(T0 - 15), shuffled)).toEqual(s);
  });

  it('starts the compression window at the first compressions, even after an early ROSC', () => {
    // Brief ROSC before any CPR, then rearrest; compressions start 20 s later.
    const early = summarize(t(0), [
      rosc(t(10)),
      rearrest(t(40)),
      start(t(60)),
      stop(t(160)),
      start(t(170)),
      end(t(260)),
    ]);
    expect(early.times.firstCompressionsAt).toBe(t(60));
    expect(early.pauses.map((p) => [p.startAt, p.seconds])).toEqual([[t(160), 10]]);
    expect(early.compressionWindowSeconds).toBe(260 - 60);
    expect(early.compressionFraction).toBe((260 - 60 - 10) / (260 - 60));
    expect(early.roscPeriods).toEqual([
      expect.objectContaining({ seconds: 30, endedBy: 'rearrest' }),
    ]);
  });

  it('has no compression fraction when no compressions were recorded', () => {
    const none = summarize(t(0), [
      rhythm(t(30), 'asystole'),
      drug(t(60), 'epinephrine', 1),
      end(t(300), 'died'),
    ]);
    expect(none.compressionFraction).toBeNull();
    expect(none.compressionWindowSeconds).toBeNull();
    expect(none.compressionSeconds).toBe(0);
    expect(none.pauses).toEqual([]);
    expect(none.longestPause).toBeNull();
    expect(none.times.firstCompressionsAt).toBeNull();
    expect(none.firstRhythmShockable).toBe(false);
  });

  it('stops compressions still running at the end; the last stop of an ended code is not a pause', () => {
    const running = summarize(t(0), [start(t(10)), end(t(70))]);
    expect(running.compressionSeconds).toBe(60);
    expect(running.compressionFraction).toBe(1);

    // Compressions stopped for good at 70 s and the code was ended at 100 s: resuscitation was
    // over, so those 30 s are not an interruption of CPR. The fraction runs to the last
    // compressions (CCF = compression time / resuscitation time: clinical sheet §3, secondary).
    const trailing = summarize(t(0), [start(t(10)), stop(t(70), 'other'), end(t(100), 'died')]);
    expect(trailing.compressionFraction).toBe(1);
    expect(trailing.compressionWindowSeconds).toBe(60);
    expect(trailing.pauses).toEqual([]);
    expect(trailing.longPauses).toEqual([]);
  });

  it('takes a compressor swap as no change to the compression clock', () => {
    const swapped = summarize(t(0), [
      start(t(0)),
      entry(t(50), { kind: 'cpr', action: 'swap' }),
      stop(t(100), 'rhythm-check'),
      entry(t(108), { kind: 'cpr', action: 'swap' }), // no start tapped: the pause goes on
      start(t(130)),
      end(t(200)),
    ]);
    expect(swapped.pauses.map((p) => p.seconds)).toEqual([30]);
    expect(swapped.compressionSeconds).toBe(100 + 70);
  });
});

describe('summarizeCode: sustained ROSC', () => {
  // Sustained ROSC = no chest compressions for >= 20 consecutive minutes (Utstein 2004
  // update, Jacobs et al., Circulation 2004;110:3385-3397, per the sheet section 4, confirmed
  // secondary). Any ROSC = any documented ROSC, however short (Utstein, sheet section 4).
  const twentyMin = 20 * 60;
  const withRoscOf = (seconds: number, endsBy: 'rearrest' | 'compressions' | 'end') => {
    const entries = [start(t(0)), stop(t(300), 'rosc'), rosc(t(300))];
    if (endsBy === 'rearrest') entries.push(rearrest(t(300 + seconds)), start(t(310 + seconds)));
    if (endsBy === 'compressions') entries.push(start(t(300 + seconds)));
    entries.push(end(t(endsBy === 'end' ? 300 + seconds : 900 + seconds)));
    return summarize(t(0), entries);
  };

  it('uses 20 minutes by default', () => {
    expect(settings.sustainedRoscSeconds).toBe(twentyMin);
  });

  it('counts 19 minutes of ROSC then rearrest as any ROSC, not sustained', () => {
    const s = withRoscOf(twentyMin - 60, 'rearrest');
    expect(s.anyRosc).toBe(true);
    expect(s.sustainedRosc).toBe(false);
    expect(s.roscPeriods[0]?.seconds).toBe(19 * 60);
  });

  it('counts 20 minutes of ROSC then rearrest as sustained', () => {
    const s = withRoscOf(twentyMin, 'rearrest');
    expect(s.sustainedRosc).toBe(true);
    expect(s.roscPeriods[0]).toMatchObject({
      seconds: twentyMin,
      endedBy: 'rearrest',
      sustained: true,
    });
  });

  it('one second short of 20 minutes is not sustained', () => {
    expect(withRoscOf(twentyMin - 1, 'rearrest').sustainedRosc).toBe(false);
  });

  it('ends ROSC when compressions restart without a rearrest entry', () => {
    const s = withRoscOf(19 * 60, 'compressions');
    expect(s.roscPeriods[0]).toMatchObject({ seconds: 19 * 60, endedBy: 'compressions' });
    expect(s.sustainedRosc).toBe(false);
  });

  it('runs a ROSC still going at the end to the end of the code', () => {
    const s = withRoscOf(twentyMin, 'end');
    expect(s.roscPeriods[0]).toMatchObject({ seconds: twentyMin, endedBy: 'end', sustained: true });
    expect(s.roscAtEnd).toBe(true);
    expect(s.sustainedRosc).toBe(true);
  });

  it('follows the configured sustained-ROSC time', () => {
    const tenMin = { ...settings, sustainedRoscSeconds: 10 * 60 };
    const entries = [start(t(0)), rosc(t(300)), rearrest(t(300 + 11 * 60)), end(t(2000))];
    expect(summarize(t(0), entries).sustainedRosc).toBe(false);
    expect(summarize(t(0), entries, tenMin).sustainedRosc).toBe(true);
  });

  it('reports no ROSC when none was recorded', () => {
    const s = summarize(t(0), [start(t(0)), end(t(600), 'died')]);
    expect(s.anyRosc).toBe(false);
    expect(s.sustainedRosc).toBe(false);
    expect(s.times.firstRoscAt).toBeNull();
    expect(s.intervals.arrestToFirstRosc).toBeNull();
  });
});

describe('summarizeCode: shocks and peri-shock pauses', () => {
  // Pre-shock pause target < 10 s, peri-shock < 20 s: common QI cut-offs from observational
  // work (Cheskes et al., Circulation 2011). FROM MEMORY per the sheet (section 3); verify.
  it('uses a 10 s pre-shock target', () => {
    expect(PRE_SHOCK_PAUSE_TARGET_SECONDS).toBe(10);
  });

  it('flags a pre-shock pause of 10 s or more and passes one under 10 s', () => {
    const s = summarize(t(0), [
      start(t(0)),
      stop(t(120), 'shock'),
      shock(t(126), 150), // 6 s pre-shock
      start(t(129)),
      stop(t(240), 'rhythm-check'),
      shock(t(252), 200), // 12 s pre-shock
      start(t(256)),
      end(t(400)),
    ]);
    expect(
      s.shocks.map((x) => [
        x.preShockPauseSeconds,
        x.postShockPauseSeconds,
        x.preShockPauseMeetsTarget,
      ]),
    ).toEqual([
      [6, 3, true],
      [12, 4, false],
    ]);
    expect(s.shocks.map((x) => x.periShockPauseSeconds)).toEqual([9, 16]);
    expect(s.shocks.map((x) => x.joules)).toEqual([150, 200]);
    expect(s.pauses.map((p) => p.preShock)).toEqual([true, true]);
  });

  it('does not count a pre-shock pause of exactly 10 s as under the target', () => {
    const s = summarize(t(0), [
      start(t(0)),
      stop(t(100)),
      shock(t(110)),
      start(t(112)),
      end(t(200)),
    ]);
    expect(s.shocks[0]?.preShockPauseSeconds).toBe(10);
    expect(s.shocks[0]?.preShockPauseMeetsTarget).toBe(false);
    expect(s.pauses[0]?.reason).toBeNull(); // no reason tapped with the stop
  });

  it('leaves the pauses unknown for a shock recorded while compressions ran', () => {
    const s = summarize(t(0), [start(t(0)), shock(t(60)), end(t(120))]);
    expect(s.shocks[0]).toMatchObject({
      preShockPauseSeconds: null,
      postShockPauseSeconds: null,
      preShockPauseMeetsTarget: null,
    });
  });

  it('has no post-shock pause when ROSC follows the shock', () => {
    const s = summarize(t(0), [
      start(t(0)),
      stop(t(100), 'shock'),
      shock(t(104)),
      rosc(t(115)),
      end(t(300)),
    ]);
    expect(s.shocks[0]).toMatchObject({
      preShockPauseSeconds: 4,
      postShockPauseSeconds: null,
      periShockPauseSeconds: null,
    });
    expect(s.pauses).toEqual([
      expect.objectContaining({ seconds: 15, endedBy: 'rosc', preShock: true }),
    ]);
  });

  it('takes the first unsynchronised shock as the first defibrillation', () => {
    const s = summarize(t(0), [
      start(t(0)),
      shock(t(30), 100, true),
      shock(t(90), 200, false),
      end(t(200)),
    ]);
    expect(s.times.firstShockAt).toBe(t(90));
    expect(s.intervals.arrestToFirstShock).toBe(90);
    expect(s.shocks.map((x) => x.synchronized)).toEqual([true, false]);
  });

  it('does not count a voided shock', () => {
    const mistaken = shock(t(40), 360);
    const s = summarize(t(0), [
      start(t(0)),
      stop(t(30), 'shock'),
      mistaken,
      entry(t(45), { kind: 'void', target: mistaken.id, reason: 'tapped twice' }),
      shock(t(50), 200),
      start(t(55)),
      end(t(100)),
    ]);
    expect(s.shocks).toHaveLength(1);
    expect(s.shocks[0]).toMatchObject({
      joules: 200,
      preShockPauseSeconds: 20,
      postShockPauseSeconds: 5,
    });
    expect(s.times.firstShockAt).toBe(t(50));
    expect(s.entryCounts).toEqual({ entries: 6, live: 5, voided: 1, amended: 0, corrections: 1 });
  });
});

describe('summarizeCode: epinephrine and drug totals', () => {
  // Epinephrine 1 mg every 3-5 min (AHA 2020 Adult Cardiac Arrest Algorithm, sheet section 1a,
  // confirmed primary copy). Window check values are the sheet's derived arithmetic (section 6):
  // doses at 02:00 and 06:30 are 4:30 apart (inside); 06:30 then 08:00 is 1:30 (early).
  const doses = [2 * 60, 6 * 60 + 30, 8 * 60, 14 * 60];
  const entries = [
    start(t(0)),
    ...doses.map((s) => drug(t(s), 'epinephrine', 1)),
    end(t(20 * 60), 'died'),
  ];
  const s = summarize(t(0), entries);

  it('uses the 3-5 minute window by default', () => {
    expect(settings.epinephrineWindowSeconds).toEqual({ min: 180, max: 300 });
  });

  it('gives each interval and its place in the window', () => {
    expect(s.epinephrineIntervals.map((i) => [i.seconds, i.status])).toEqual([
      [doses[1]! - doses[0]!, 'within'], // 270 s
      [doses[2]! - doses[1]!, 'early'], // 90 s
      [doses[3]! - doses[2]!, 'late'], // 360 s
    ]);
    expect(s.epinephrineOutsideWindow.map((i) => i.status)).toEqual(['early', 'late']);
    expect(s.intervals.arrestToFirstEpinephrine).toBe(doses[0]);
  });

  it('counts exactly 3 and exactly 5 minutes as inside the window', () => {
    const edge = summarize(t(0), [
      drug(t(0), 'Epinephrine', 1),
      drug(t(180), 'epinephrine', 1),
      drug(t(480), 'epinephrine', 1),
    ]);
    expect(edge.epinephrineIntervals.map((i) => i.status)).toEqual(['within', 'within']);
  });

  it('follows a configured window', () => {
    const tight = { ...settings, epinephrineWindowSeconds: { min: 280, max: 400 } };
    const st = summarize(t(0), entries, tight);
    expect(st.epinephrineIntervals.map((i) => i.status)).toEqual(['early', 'early', 'within']);
    const wide = { ...settings, epinephrineWindowSeconds: { min: 60, max: 400 } };
    expect(summarize(t(0), entries, wide).epinephrineOutsideWindow).toEqual([]);
  });

  it('leaves intervals that span ROSC out of the outside-window list', () => {
    const st = summarize(t(0), [
      start(t(0)),
      drug(t(60), 'epinephrine', 1),
      rosc(t(120)),
      rearrest(t(900)),
      start(t(905)),
      drug(t(960), 'epinephrine', 1),
      end(t(1200)),
    ]);
    expect(st.epinephrineIntervals).toEqual([
      expect.objectContaining({ seconds: 900, status: 'late', spansRosc: true }),
    ]);
    expect(st.epinephrineOutsideWindow).toEqual([]);
  });

  it('does not take norepinephrine for epinephrine', () => {
    const st = summarize(t(0), [
      drug(t(30), 'norepinephrine', 4, 'ug'),
      drug(t(90), 'Adrenaline', 1),
    ]);
    expect(st.times.firstEpinephrineAt).toBe(t(90));
    expect(st.epinephrineDoses).toHaveLength(1);
  });

  it('totals each drug per unit, using an amended dose', () => {
    const wrongDose = drug(t(300), 'amiodarone', 3000);
    const st = summarize(t(0), [
      drug(t(120), 'epinephrine', 1),
      wrongDose,
      drug(t(420), 'Epinephrine', 1),
      entry(t(430), {
        kind: 'amend',
        target: wrongDose.id,
        changes: { dose: 300 },
        reason: 'dose was 300 mg',
      }),
      drug(t(500), 'amiodarone', 150),
      drug(t(600), 'epinephrine', 100, 'ug'), // kept apart: never converted across units
      drug(t(650), 'Sodium bicarbonate 8.4%', 50, 'meq'),
    ]);
    expect(st.drugTotals.map((d) => [d.drug, d.unit, d.total, d.doses])).toEqual([
      ['epinephrine', 'mg', 1 + 1, 2],
      ['amiodarone', 'mg', 300 + 150, 2], // 450 mg: the sheet's amiodarone maximum (section 6)
      ['epinephrine', 'ug', 100, 1],
      ['sodium-bicarbonate', 'meq', 50, 1],
    ]);
    expect(st.entryCounts).toEqual({ entries: 6, live: 6, voided: 0, amended: 1, corrections: 1 });
  });

  it('moves a time point when the entry time is amended', () => {
    const late = drug(t(400), 'epinephrine', 1);
    const st = summarize(t(0), [
      late,
      entry(t(500), {
        kind: 'amend',
        target: late.id,
        changes: { at: t(240) },
        reason: 'given earlier',
      }),
    ]);
    expect(st.intervals.arrestToFirstEpinephrine).toBe(240);
  });
});

describe('summarizeCode: end of the code', () => {
  it('prefers the end entry to the code row; later clinical entries still show', () => {
    const st = summarizeCode({
      code: code(t(0), t(700)),
      entries: [
        start(t(0)),
        end(t(600), 'died'),
        start(t(610)), // after the end: the compression clock is frozen
        rosc(t(620)),
        shock(t(650)),
        drug(t(660), 'epinephrine', 1),
      ],
      settings,
    });
    expect(st.times.endedAt).toBe(t(600));
    expect(st.durationSeconds).toBe(600);
    expect(st.compressionSeconds).toBe(600);
    expect(st.anyRosc).toBe(false);
    expect(st.times.firstRoscAt).toBeNull();
    // Nothing recorded is hidden: the late shock and dose are listed for the reviewer to see.
    expect(st.shocks).toEqual([
      expect.objectContaining({ at: t(650), preShockPauseSeconds: null }),
    ]);
    expect(st.drugTotals).toEqual([expect.objectContaining({ drug: 'epinephrine', total: 1 })]);
    expect(st.entryCounts.entries).toBe(6);
  });

  it('uses the code row when the log has no end entry', () => {
    const st = summarizeCode({ code: code(t(0), t(700)), entries: [start(t(100))], settings });
    expect(st.durationSeconds).toBe(700);
    expect(st.compressionSeconds).toBe(600);
  });

  it('summarises a code still running up to asOf', () => {
    const st = summarizeCode({
      code: code(t(0)),
      entries: [start(t(10)), rosc(t(100))],
      settings,
      asOf: t(100 + 25 * 60),
    });
    expect(st.times.endedAt).toBeNull();
    expect(st.durationSeconds).toBeNull();
    expect(st.horizonAt).toBe(t(100 + 25 * 60));
    expect(st.roscPeriods[0]).toMatchObject({ seconds: 25 * 60, endedBy: 'end', sustained: true });
    expect(st.roscAtEnd).toBe(false); // not ended yet
  });
});

describe('SUMMARY_DEFINITIONS', () => {
  it('defines every headline metric in one sentence', () => {
    const summaryKeys = Object.keys(summarize(t(0), [start(t(0)), end(t(60))])).filter(
      (k) => !['times', 'intervals', 'horizonAt', 'epinephrineDoses', 'entryCounts'].includes(k),
    );
    const s = summarize(t(0), [start(t(0)), end(t(60))]);
    const keys = [
      ...summaryKeys,
      ...Object.keys(s.times),
      ...Object.keys(s.intervals),
      'entryCounts',
    ];
    expect(keys.length).toBeGreaterThan(30);
    for (const key of keys) expect(SUMMARY_DEFINITIONS).toHaveProperty(key);
    for (const text of Object.values(SUMMARY_DEFINITIONS)) {
      expect(text).toMatch(/^[A-Z].*\.$/);
      expect(text.split(/\.\s/).length).toBe(1);
    }
  });
});
