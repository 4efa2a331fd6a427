import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import {
  codePicture,
  codePictureSvg,
  effectiveEntries,
  flaggedDoseText,
  resolveDrug,
  SIGNATURE_MEANING_TEXT,
  SIGNATURE_MEANINGS,
  SUMMARY_DEFINITIONS,
  summarize,
  UTSTEIN_FIELD_LABELS,
  UTSTEIN_GROUPS,
  utsteinValueText,
  type ClinicalEntry,
  type CodeSummary,
  type EffectiveEntry,
  type EntryChainStatus,
  type RecordIntegrity,
  type LogEntry,
  type ProtocolSettings,
  type RecordSignature,
  type RecordStatus,
  type SummaryMetric,
  type Timeline,
  type UtsteinDetails,
  type UtsteinField,
} from '@steadyhand/shared';
import type { Content, TableCell, TDocumentDefinitions } from 'pdfmake/interfaces.js';
import { woffToSfnt } from './pdf-fonts.js';
import type { CanonicalRecord } from './record-canonical.js';

// pdfmake 0.3 is CommonJS and keeps its settings on one shared instance.
const require = createRequire(import.meta.url);
const pdfmake = require('pdfmake') as typeof import('pdfmake') & {
  /** pdfmake's in-memory files (base.js), read before the disk; missing from @types/pdfmake. */
  virtualfs: { writeFileSync(name: string, content: Buffer): void };
};

const FONT_REGULAR = require.resolve('@fontsource/atkinson-hyperlegible/files/atkinson-hyperlegible-latin-400-normal.woff');
const FONT_BOLD = require.resolve('@fontsource/atkinson-hyperlegible/files/atkinson-hyperlegible-latin-700-normal.woff');
/**
 * The fonts' PostScript names. pdfkit keeps each opened font under its PostScript name, so the
 * picture's SVG text, which asks for the font by the name pdfmake was given, finds the font
 * already open instead of reading and parsing the file again for every label.
 */
const REGULAR = 'AtkinsonHyperlegible-Regular';
const BOLD = 'AtkinsonHyperlegible-Bold';

let configured = false;
/** Once per process: our font unpacked in memory, no network and no file access. */
function configurePdfmake(): void {
  if (configured) return;
  pdfmake.virtualfs.writeFileSync(REGULAR, woffToSfnt(readFileSync(FONT_REGULAR)));
  pdfmake.virtualfs.writeFileSync(BOLD, woffToSfnt(readFileSync(FONT_BOLD)));
  pdfmake.addFonts({ Atkinson: { normal: REGULAR, bold: BOLD, italics: REGULAR, bolditalics: BOLD } });
  pdfmake.setUrlAccessPolicy(() => false);
  pdfmake.setLocalAccessPolicy(() => false);
  configured = true;
}

export async function renderPdf(definition: TDocumentDefinitions): Promise<Buffer> {
  configurePdfmake();
  return pdfmake.createPdf(definition).getBuffer();
}

export interface RecordPdfInput {
  record: CanonicalRecord;
  digest: string;
  /** The entry chain as checked when printing; one line beside the digest. */
  chain: EntryChainStatus;
  /** Every tamper check as of printing: a failure is printed on the first page and at every foot. */
  integrity: RecordIntegrity;
  status: RecordStatus;
  /** The one fold of the record's log, with the code's own protocol version: summary, picture and settings all read it. */
  timeline: Timeline;
  signatures: RecordSignature[];
  /** userId → printed name, for the "recorded by" column (an entry's own kept name comes first). */
  people: ReadonlyMap<string, string>;
  timeZone: string;
  generatedAt: string;
  /** The server key that stamps this copy (listed at GET /api/records/public-keys). */
  keyId: string;
  /** The verification stamp for the Keywords field. */
  stamp: string;
}

// --- wording ---------------------------------------------------------------------------------

const RHYTHM_TEXT: Record<string, string> = { vf: 'VF', pvt: 'pVT', pea: 'PEA', asystole: 'Asystole', organized: 'Organised rhythm', other: 'Other rhythm' };
const ROUTE_TEXT: Record<string, string> = { iv: 'IV', io: 'IO', et: 'ET', other: 'other route' };
// "mcg", not "ug" or the micro sign, on paper: ISMP's list of error-prone abbreviations.
const UNIT_TEXT: Record<string, string> = { mg: 'mg', ug: 'mcg', g: 'g', meq: 'mEq', mL: 'mL' };
const STOP_REASON_TEXT: Record<string, string> = { 'rhythm-check': 'for a rhythm check', shock: 'for a shock', airway: 'for the airway', rosc: 'for ROSC', other: 'other reason' };
const AIRWAY_TEXT: Record<string, string> = { 'bag-mask': 'Bag-mask', supraglottic: 'Supraglottic airway', endotracheal: 'Endotracheal tube' };
const CONFIRMATION_TEXT: Record<string, string> = { 'waveform-capnography': 'waveform capnography', colorimetric: 'colorimetric CO2', auscultation: 'auscultation', other: 'other means' };
// Both words for an ended-in-ROSC code read the same: whether ROSC was sustained is computed, never chosen.
const OUTCOME_TEXT: Record<string, string> = { 'sustained-rosc': 'ROSC at the end of the code', rosc: 'ROSC at the end of the code', died: 'Died', transferred: 'Transferred', other: 'Other' };
const STATUS_TEXT: Record<RecordStatus, string> = {
  draft: 'DRAFT — not signed',
  'partly-signed': 'Partly signed — awaiting the second signature',
  signed: 'Signed by recorder and team leader',
};

// Text in the page header too: the diagonal mark is drawn rotated, which text extraction skips.
const HEADER_STATUS: Record<RecordStatus, string> = { draft: 'DRAFT — not signed', 'partly-signed': 'Partly signed', signed: 'Signed' };

/** One line at every page's foot: every check passed, or the first failure and how many more. */
export function integrityLine(integrity: RecordIntegrity): string {
  if (integrity.valid) return 'Record check: entry chain, seal, signatures and attachment files all verify';
  const more = integrity.problems.length - 1;
  // One line at the foot: the whole list is on page 1.
  const first = integrity.problems[0] ?? '';
  const shown = first.length > 110 ? `${first.slice(0, 109)}…` : first;
  return `RECORD CHECK FAILED: ${shown}${more > 0 ? ` (+${more} more on page 1)` : ''}`;
}

/** "Entry chain: 32 entries, head 3f2a…, intact", or where it breaks. */
export function chainLine(chain: EntryChainStatus): string {
  if (!chain.valid) return `Entry chain: BROKEN at position ${chain.brokenAt.position}: ${chain.brokenAt.reason}`;
  if (!chain.head) return 'Entry chain: no entries';
  return `Entry chain: ${chain.length} ${chain.length === 1 ? 'entry' : 'entries'}, head ${chain.head.slice(0, 16)}…, intact`;
}

function num(n: number): string {
  return Number.isInteger(n) ? String(n) : String(Math.round(n * 1000) / 1000);
}

/** "What" and "details" for one clinical entry, in the words of the trade. */
export function describeEntry(entry: ClinicalEntry, settings: ProtocolSettings): { what: string; details: string } {
  switch (entry.kind) {
    case 'cpr':
      if (entry.action === 'start') return { what: 'Compressions started', details: '' };
      if (entry.action === 'swap') return { what: 'Compressor swap', details: '' };
      return { what: 'Compressions stopped', details: entry.reason ? STOP_REASON_TEXT[entry.reason] ?? entry.reason : '' };
    case 'rhythm':
      return { what: 'Rhythm check', details: `${RHYTHM_TEXT[entry.rhythm] ?? entry.rhythm}, ${entry.pulse ? 'pulse present' : 'no pulse'}` };
    case 'shock':
      return { what: 'Shock', details: `${num(entry.joules)} J, ${entry.synchronized ? 'synchronised' : 'unsynchronised'}` };
    case 'drug': {
      const label = resolveDrug(settings, entry.drug)?.label ?? entry.drug;
      return { what: `${label} ${num(entry.dose)} ${UNIT_TEXT[entry.unit] ?? entry.unit}`, details: ROUTE_TEXT[entry.route] ?? entry.route };
    }
    case 'airway':
      return {
        what: 'Airway',
        details: `${AIRWAY_TEXT[entry.device] ?? entry.device}${entry.confirmation ? `, confirmed by ${CONFIRMATION_TEXT[entry.confirmation] ?? entry.confirmation}` : ''}`,
      };
    case 'access':
      return { what: 'Vascular access', details: `${entry.route.toUpperCase()}${entry.site ? `, ${entry.site}` : ''}` };
    case 'etco2':
      return { what: 'ETCO2', details: `${num(entry.mmHg)} mmHg` };
    case 'lab':
      return { what: 'Lab result', details: `${entry.name} ${num(entry.value)} ${entry.unit}` };
    case 'rosc':
      return { what: 'ROSC', details: 'Return of spontaneous circulation' };
    case 'rearrest':
      return { what: 'Re-arrest', details: '' };
    case 'note':
      return { what: 'Note', details: entry.text };
    case 'end':
      return { what: 'Code ended', details: `Outcome: ${OUTCOME_TEXT[entry.outcome] ?? entry.outcome}` };
  }
}

// --- time ------------------------------------------------------------------------------------

interface Clock {
  time(iso: string): string;
  date(iso: string): string;
  dateTime(iso: string): string;
  zone: string;
}

function makeClock(timeZone: string, reference: string): Clock {
  const time = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23' });
  const date = new Intl.DateTimeFormat('en-GB', { timeZone, day: 'numeric', month: 'long', year: 'numeric' });
  const shortDate = new Intl.DateTimeFormat('en-GB', { timeZone, day: 'numeric', month: 'short' });
  const offset = new Intl.DateTimeFormat('en-GB', { timeZone, timeZoneName: 'shortOffset' })
    .formatToParts(new Date(reference))
    .find((p) => p.type === 'timeZoneName')?.value;
  const referenceDay = date.format(new Date(reference));
  return {
    // A clock time on another day than the arrest carries its date, so a code past midnight reads right.
    time: (iso) => {
      const d = new Date(iso);
      const t = time.format(d);
      return date.format(d) === referenceDay ? t : `${shortDate.format(d)} ${t}`;
    },
    date: (iso) => date.format(new Date(iso)),
    dateTime: (iso) => `${date.format(new Date(iso))}, ${time.format(new Date(iso))}`,
    zone: timeZone === 'UTC' || timeZone === 'Etc/UTC' || !offset ? timeZone : `${timeZone}, ${offset}`,
  };
}

/** "+05:45", "+1:02:05", "-00:05": time since the arrest was recognised. */
export function sinceArrest(seconds: number): string {
  const sign = seconds < 0 ? '-' : '+';
  const s = Math.round(Math.abs(seconds));
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  const r = s % 60;
  const mm = String(m).padStart(2, '0');
  const ss = String(r).padStart(2, '0');
  // Beyond a day (an addendum timed long after) the days say more than a huge hour count.
  if (h >= 24) return `${sign}${Math.floor(h / 24)} d ${h % 24} h`;
  return h > 0 ? `${sign}${h}:${mm}:${ss}` : `${sign}${mm}:${ss}`;
}

/** "45 s", "5 min 45 s", "1 h 02 min". */
export function duration(seconds: number): string {
  const s = Math.round(seconds);
  if (s < 60) return `${s} s`;
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  const r = s % 60;
  if (h > 0) return `${h} h ${String(m).padStart(2, '0')} min`;
  return r ? `${m} min ${r} s` : `${m} min`;
}

// --- document --------------------------------------------------------------------------------

const GREY = '#555555';
const RULE = '#9a9a9a';

const thinLines = {
  hLineWidth: (i: number) => (i === 1 ? 0.8 : 0.3),
  vLineWidth: () => 0,
  hLineColor: () => RULE,
  paddingTop: () => 2,
  paddingBottom: () => 2,
  paddingLeft: () => 3,
  paddingRight: () => 3,
};

function heading(text: string): Content {
  return { text, style: 'h2', margin: [0, 12, 0, 4] };
}

function factRows(rows: [string, string][]): Content {
  return {
    table: { widths: [170, '*'], body: rows.map(([k, v]) => [{ text: k, bold: true }, { text: v }]) },
    layout: 'noBorders',
    margin: [0, 0, 0, 2],
  };
}

const TIME_FIELDS: readonly UtsteinField[] = ['teamArrivedAt', 'padsOnAt', 'deathPronouncedAt'];

/**
 * The registry details as signed (or, unsigned, as they stand), then each change made after the
 * first signature with who made it, when, and the value before.
 */
function registryDetails(details: UtsteinDetails, addenda: NonNullable<CanonicalRecord['detailAddenda']>, dateTime: (iso: string) => string): Content[] {
  const text = (field: UtsteinField, d: UtsteinDetails) => {
    const v = d[field];
    if (v === undefined) return 'not entered';
    return TIME_FIELDS.includes(field) && typeof v === 'string' ? dateTime(v) : (utsteinValueText(field, d) ?? 'not entered');
  };
  const rows = UTSTEIN_GROUPS.flatMap((g) => g.fields.filter((f) => details[f] !== undefined).map((f): [string, string] => [UTSTEIN_FIELD_LABELS[f], text(f, details)]));
  const out: Content[] = [rows.length ? factRows(rows) : { text: 'None entered.', color: GREY }];
  if (addenda.length) {
    out.push({ text: 'Changed after signing (addenda):', bold: true, margin: [0, 4, 0, 2] });
    out.push({
      ul: addenda.flatMap((a) =>
        Object.entries(a.changes).map(([field, change]) => {
          const f = field as UtsteinField;
          const was = change.from === null ? 'not entered' : text(f, { [f]: change.from });
          const now = change.to === null ? 'cleared' : text(f, { [f]: change.to });
          return `${UTSTEIN_FIELD_LABELS[f]}: ${now} (was: ${was}). ${a.userName}, ${dateTime(a.recordedAt)}.`;
        }),
      ),
    });
  }
  return out;
}

export function buildRecordPdf(input: RecordPdfInput): TDocumentDefinitions {
  const { record, digest, timeline: folded, status, people } = input;
  const settings = folded.protocol;
  const s = summarize(folded);
  const code = record.code;
  const clock = makeClock(input.timeZone, code.arrestAt);
  const arrestMs = Date.parse(code.arrestAt);
  const at = (iso: string | null) => (iso ? clock.time(iso) : 'not recorded');
  const fromArrest = (seconds: number | null) => (seconds === null ? '' : duration(seconds));
  const who = (userId: string | undefined) => (userId ? (people.get(userId) ?? userId) : '');
  // The name kept with a stored entry when it was written, whatever the person is called now.
  const writerOf = (entryId: string, userId: string | undefined) => byId.get(entryId)?.userName ?? who(userId);

  const patient = code.patient;
  const patientText =
    patient && (patient.name || patient.mrn)
      ? [patient.name ?? 'Name not recorded', patient.mrn ? `MRN ${patient.mrn}` : 'MRN not recorded'].join(', ')
      : 'Unknown patient';
  const patientMore = patient
    ? [patient.birthDate ? `born ${patient.birthDate}` : '', patient.sex ? `sex ${patient.sex}` : ''].filter(Boolean).join(', ')
    : '';
  const location = code.location ?? 'Location not recorded';
  const category = code.category === 'pediatric' ? 'Pediatric' : 'Adult';
  const weight = code.weightKg !== null ? `${num(code.weightKg)} kg` : 'weight not recorded';

  // --- the picture: vector, from the same fold as the summary ---
  const pictureWidth = 523; // A4 less the side margins
  const picture: Content = { svg: codePictureSvg(codePicture(folded, { width: pictureWidth, scale: 0.85 }), { font: 'Atkinson' }), width: pictureWidth };

  // --- summary ---
  const timePoints: [string, string | null, number | null][] = [
    ['Arrest recognised', s.times.arrestAt, null],
    ['First compressions', s.times.firstCompressionsAt, s.intervals.arrestToFirstCompressions],
    ['First rhythm check', s.times.firstRhythmAnalysisAt, s.intervals.arrestToFirstRhythmAnalysis],
    ['First defibrillation', s.times.firstShockAt, s.intervals.arrestToFirstShock],
    ['First epinephrine', s.times.firstEpinephrineAt, s.intervals.arrestToFirstEpinephrine],
    ['First ROSC', s.times.firstRoscAt, s.intervals.arrestToFirstRosc],
    ['Code ended', s.times.endedAt, s.intervals.arrestToEnd],
  ];
  const timeTable: Content = {
    table: {
      headerRows: 1,
      widths: [150, 90, 110],
      body: [
        [{ text: 'Time point', bold: true }, { text: 'Clock time', bold: true }, { text: 'From arrest', bold: true }],
        ...timePoints.map(([label, iso, secs]): TableCell[] => [label, at(iso), iso ? fromArrest(secs) : '']),
      ],
    },
    layout: thinLines,
  };

  const longestRosc = s.roscPeriods.reduce((m, r) => Math.max(m, r.seconds), 0);
  const sustainedMin = Math.round(settings.sustainedRoscSeconds / 60);
  const { min: wMin, max: wMax } = settings.epinephrineWindowSeconds;
  const windowText = wMin % 60 === 0 && wMax % 60 === 0 ? `${wMin / 60}–${wMax / 60} min` : `${duration(wMin)} to ${duration(wMax)}`;
  const pauseText = (p: CodeSummary['pauses'][number]) =>
    `${clock.time(p.startAt)}, ${duration(p.seconds)}${p.reason ? ` (${STOP_REASON_TEXT[p.reason] ?? p.reason})` : ''}${p.preShock ? ', pre-shock' : ''}`;
  const facts: [string, string][] = [
    ['First documented rhythm', s.firstRhythm ? `${RHYTHM_TEXT[s.firstRhythm] ?? s.firstRhythm} (${s.firstRhythmShockable ? 'shockable' : 'not shockable'})` : 'not recorded'],
    ['Any ROSC', s.anyRosc ? `Yes, first at ${at(s.times.firstRoscAt)}` : 'No'],
    [
      `Sustained ROSC (${sustainedMin} min or more)`,
      s.sustainedRosc === true
        ? 'Yes'
        : s.sustainedRosc === null
          ? `Not observed: the code ended after ${duration(longestRosc)} of ROSC`
          : s.anyRosc
            ? `No (longest ROSC period ${duration(longestRosc)})`
            : 'No',
    ],
    ['Outcome', s.outcome ? (OUTCOME_TEXT[s.outcome] ?? s.outcome) : 'not recorded'],
    ['Protocol', `Version ${s.protocolVersion ?? 1}: ${s.protocolEdition}`],
    [
      'Compression fraction',
      s.compressionFraction === null
        ? 'not available (no compressions recorded)'
        : `${Math.round(s.compressionFraction * 100)}% (${duration(s.compressionSeconds)} of ${duration(s.compressionWindowSeconds ?? 0)})`,
    ],
    [`Pauses over ${settings.pauseWarningSeconds} s`, s.longPauses.length ? `${s.longPauses.length}: ${s.longPauses.map(pauseText).join('; ')}` : 'None'],
    ['Longest pause', s.longestPause ? pauseText(s.longestPause) : 'None recorded'],
    ['How measured', s.tapsNote],
    ['Doses to check', s.flaggedDoses.length ? s.flaggedDoses.map(flaggedDoseText).join('; ') : 'None'],
    [
      `Epinephrine intervals outside ${windowText}`,
      s.epinephrineIntervals.length === 0
        ? 'Fewer than two doses: no interval'
        : s.epinephrineOutsideWindow.length
          ? s.epinephrineOutsideWindow.map((i) => `${clock.time(i.fromAt)} to ${clock.time(i.toAt)}: ${duration(i.seconds)} (${i.status})`).join('; ')
          : `None (${s.epinephrineIntervals.length} interval${s.epinephrineIntervals.length === 1 ? '' : 's'}, all within)`,
    ],
    [
      'Drug totals',
      s.drugTotals.length
        ? s.drugTotals.map((d) => `${d.label} ${num(d.total)} ${UNIT_TEXT[d.unit] ?? d.unit} (${d.doses} dose${d.doses === 1 ? '' : 's'})`).join('; ')
        : 'No drugs recorded',
    ],
    [
      'Shocks',
      s.shocks.length
        ? `${s.defibrillationCount} defibrillation${s.defibrillationCount === 1 ? '' : 's'}, ${s.cardioversionCount} synchronised: ` +
          s.shocks
            .map((x) => `${clock.time(x.at)} ${num(x.joules)} J${x.synchronized ? ' synchronised' : ''}${x.preShockPauseSeconds !== null ? `, pre-shock pause ${duration(x.preShockPauseSeconds)}` : ''}`)
            .join('; ')
        : 'None',
    ],
  ];

  const legendKeys: SummaryMetric[] = [
    'arrestAt', 'firstCompressionsAt', 'firstRhythmAnalysisAt', 'firstShockAt', 'firstEpinephrineAt', 'firstRoscAt', 'endedAt',
    'firstRhythm', 'anyRosc', 'sustainedRosc', 'compressionFraction', 'longPauses', 'longestPause', 'preShockPause',
    'epinephrineOutsideWindow', 'drugTotals', 'shocks',
  ];
  const legendLabels: Partial<Record<SummaryMetric, string>> = {
    arrestAt: 'Arrest recognised', firstCompressionsAt: 'First compressions', firstRhythmAnalysisAt: 'First rhythm check',
    firstShockAt: 'First defibrillation', firstEpinephrineAt: 'First epinephrine', firstRoscAt: 'First ROSC', endedAt: 'Code ended',
    firstRhythm: 'First documented rhythm', anyRosc: 'Any ROSC', sustainedRosc: 'Sustained ROSC', compressionFraction: 'Compression fraction',
    longPauses: 'Pauses over the limit', longestPause: 'Longest pause', preShockPause: 'Pre-shock pause',
    epinephrineOutsideWindow: 'Epinephrine outside window', drugTotals: 'Drug totals', shocks: 'Shocks',
  };
  const legend: Content = {
    stack: legendKeys.map((k) => ({ text: [{ text: `${legendLabels[k] ?? k}: `, bold: true }, SUMMARY_DEFINITIONS[k]] })),
    style: 'legend',
    margin: [0, 4, 0, 0],
  };

  // --- timeline ---
  const all = record.entries as LogEntry[];
  const byId = new Map(record.entries.map((e) => [e.id, e]));
  const line = (e: ClinicalEntry) => {
    const d = describeEntry(e, settings);
    return d.details ? `${d.what}, ${d.details}` : d.what;
  };
  const timelineRows: TableCell[][] = effectiveEntries(all).map((e: EffectiveEntry): TableCell[] => {
    const { original, amendments, voided, ...current } = e;
    const d = describeEntry(current, settings);
    const markers: Content[] = [];
    let before: ClinicalEntry = original;
    for (const a of amendments) {
      const after: ClinicalEntry = { ...before, ...a.changes };
      // Say only what changed: the time, the "what" (a drug's dose lives there) or the details.
      const b = describeEntry(before, settings);
      const n = describeEntry(after, settings);
      const part = (x: { what: string; details: string }, iso: string) =>
        [before.at !== after.at ? `at ${clock.time(iso)}` : '', b.what !== n.what ? x.what : '', b.details !== n.details ? x.details : '']
          .filter(Boolean)
          .join(', ');
      const was = part(b, before.at) || line(before);
      const now = part(n, after.at) || line(after);
      const addendum = byId.get(a.id)?.addendum ? ' (addendum)' : '';
      markers.push({
        text: [
          { text: `AMENDED${addendum} `, bold: true },
          `${clock.time(byId.get(a.id)?.recordedAt ?? a.at)} by ${writerOf(a.id, a.userId)}. Was: ${was}. Now: ${now}. Reason: ${a.reason}`,
        ],
        style: 'marker',
      });
      before = after;
    }
    if (voided) {
      const addendum = byId.get(voided.id)?.addendum ? ' (addendum)' : '';
      markers.push({
        text: [{ text: `VOIDED${addendum} `, bold: true }, `${clock.time(byId.get(voided.id)?.recordedAt ?? voided.at)} by ${writerOf(voided.id, voided.userId)}. Reason: ${voided.reason}`],
        style: 'marker',
      });
    }
    if (e.addendum) markers.push({ text: [{ text: 'ADDENDUM ', bold: true }, `added after signing, ${clock.dateTime(e.recordedAt ?? e.at)}`], style: 'marker' });
    // A voided entry stays readable, struck through, and says so in words (never by style alone).
    const strike = voided ? { decoration: 'lineThrough' as const } : {};
    return [
      { text: clock.time(e.at), ...strike },
      { text: sinceArrest((Date.parse(e.at) - arrestMs) / 1000), ...strike },
      { text: d.what, bold: true, ...strike },
      markers.length > 0 ? { stack: [{ text: d.details, ...strike }, ...markers] } : { text: d.details, ...strike },
      { text: writerOf(e.id, e.userId) },
      { text: e.deviceId ?? '' },
    ];
  });
  const timeline: Content = {
    table: {
      headerRows: 1,
      dontBreakRows: true,
      widths: [46, 44, 90, '*', 82, 50],
      body: [
        ['Clock time', 'Since arrest', 'What', 'Details and corrections', 'Recorded by', 'Device'].map((h) => ({ text: h, bold: true })),
        ...(timelineRows.length ? timelineRows : [[{ text: 'No entries recorded.', colSpan: 6 }, '', '', '', '', '']]),
      ],
    },
    layout: thinLines,
    fontSize: 8,
    // Denser than body text: six hundred rows must stay readable without running to extra pages.
    lineHeight: 1.05,
  };
  const counts = s.entryCounts;
  const addenda = record.entries.filter((e) => e.addendum).length;

  // --- attachments ---
  const attachmentsBlock: Content = record.attachments.length
    ? {
        table: {
          headerRows: 1,
          widths: ['*', 70, 50, 100],
          body: [
            ['File and SHA-256', 'Type', 'Size', 'Uploaded'].map((h) => ({ text: h, bold: true })),
            ...record.attachments.map((a): TableCell[] => [
              { stack: [a.filename, { text: `SHA-256 ${a.sha256}`, style: 'mono' }] },
              a.mediaType,
              `${Math.max(1, Math.round(a.sizeBytes / 1024))} KB`,
              clock.dateTime(a.uploadedAt),
            ]),
          ],
        },
        layout: thinLines,
        fontSize: 8,
      }
    : { text: 'No attachments.', color: GREY };

  // --- signatures ---
  const signatureLines: Content[] = SIGNATURE_MEANINGS.map((meaning) => {
    const sig = input.signatures.find((x) => x.meaning === meaning);
    if (!sig) {
      return { text: [{ text: `${SIGNATURE_MEANING_TEXT[meaning]}: `, bold: true }, { text: 'not yet signed', color: GREY }], margin: [0, 2, 0, 2] };
    }
    return {
      stack: [
        { text: [{ text: `${sig.meaningText}: `, bold: true }, { text: sig.printedName, bold: true }] },
        {
          text: `Signed ${clock.dateTime(sig.signedAt)} ${clock.zone}, password re-entered at signing. Server key ${sig.keyId ?? 'unknown'}. Server check of this signature: ${sig.valid ? 'verified' : 'FAILED, this signature does not match the record'}.`,
          style: 'small',
        },
      ],
      margin: [0, 2, 0, 4],
    };
  });

  const statusBox: Content = {
    table: {
      widths: ['*'],
      body: [[{ text: `Record status: ${STATUS_TEXT[status]}`, bold: true, fontSize: 11, margin: [4, 3, 4, 3] }]],
    },
    layout: { hLineWidth: () => (status === 'signed' ? 0.8 : 2), vLineWidth: () => (status === 'signed' ? 0.8 : 2) },
    margin: [0, 6, 0, 6],
  };

  // A failed check is said first, in words, before anything the record says.
  const integrityBox: Content[] = input.integrity.valid
    ? []
    : [
        {
          table: {
            widths: ['*'],
            body: [
              [
                {
                  stack: [
                    { text: 'RECORD CHECK FAILED: this record was changed outside Steadyhand. Do not rely on it; tell the administrator.', bold: true, fontSize: 11 },
                    { ul: input.integrity.problems, fontSize: 8, margin: [0, 3, 0, 0] },
                  ],
                  margin: [4, 3, 4, 3],
                },
              ],
            ],
          },
          layout: { hLineWidth: () => 2.5, vLineWidth: () => 2.5 },
          margin: [0, 0, 0, 6],
        },
      ];

  const content: Content[] = [
    { text: 'Resuscitation record', style: 'h1' },
    { text: `${record.facility} — ${location}`, fontSize: 12, bold: true, margin: [0, 2, 0, 0] },
    statusBox,
    ...integrityBox,
    factRows([
      ['Patient', patientText + (patientMore ? ` (${patientMore})` : '')],
      ['Category and weight', `${category}, ${weight}`],
      ['Arrest recognised', `${clock.date(code.arrestAt)}, ${clock.time(code.arrestAt)}`],
      ['Clock times', `${clock.zone}, from the server-corrected device clocks`],
      ['Record id', code.id],
      ['Copy made', `${clock.dateTime(input.generatedAt)} ${clock.zone}, stamped with server key ${input.keyId}`],
    ]),
    heading('The code at a glance'),
    picture,
    {
      text: 'Minutes from the arrest. Bars: compressions; hatched box: a pause over the warning, with its seconds; square: rhythm check; triangle: shock (hollow: synchronised); diamond: drug; circle: airway; cross: access; line: ETCO2 (mmHg); * corrected after recording.',
      style: 'legend',
      margin: [0, 2, 0, 0],
    },
    heading('Summary'),
    timeTable,
    { text: '', margin: [0, 4, 0, 0] },
    factRows(facts),
    legend,
    heading('Team'),
    code.team.length
      ? { ul: code.team.map((m) => `${m.name} — ${m.role}`) }
      : { text: 'Not recorded.', color: GREY },
    heading('Debrief notes'),
    { text: code.debriefNotes ?? 'None recorded.', color: code.debriefNotes ? undefined : GREY },
    heading('Registry details'),
    ...registryDetails(code.utstein ?? {}, record.detailAddenda ?? [], (iso) => clock.dateTime(iso)),
    heading('Timeline'),
    {
      text: `${counts.entries} entries (${counts.voided} voided, ${counts.amended} amended, ${addenda} added after signing). Corrections never remove anything: the original stays visible beside the correction, with who made it, when and why.`,
      style: 'small',
      margin: [0, 0, 0, 4],
    },
    timeline,
    heading('Attachments'),
    attachmentsBlock,
    heading('Signatures'),
    ...signatureLines,
    {
      text: [
        'Meaning of the signatures. "Recorded by": the signer made this record and attests that it is complete and accurate. ',
        '"Reviewed and confirmed by": the team leader reviewed the record and confirms it. ',
        `Each signature is bound to this record by its SHA-256 digest and the server's Ed25519 signature, made with the server key named beside it (the server lists its keys, with the period each signed in, at /api/records/public-keys); to check a copy, upload it on the verification page or enter the digest printed at the foot of each page.`,
      ],
      style: 'small',
      margin: [0, 6, 0, 0],
    },
  ];

  return {
    pageSize: 'A4',
    pageMargins: [36, 58, 36, 54],
    info: {
      title: `Resuscitation record ${code.id}`,
      author: record.facility,
      subject: `Steadyhand resuscitation record ${code.id}, SHA-256 ${digest}`,
      keywords: input.stamp,
      creator: 'Steadyhand',
      producer: 'Steadyhand',
    },
    header: () => ({
      margin: [36, 18, 36, 0],
      stack: [
        {
          columns: [
            { text: record.facility, bold: true, fontSize: 9 },
            { text: `Resuscitation record — ${location}`, alignment: 'right', fontSize: 9 },
          ],
        },
        {
          columns: [
            { text: patientText, fontSize: 8, color: GREY },
            { text: `Arrest ${clock.date(code.arrestAt)} ${clock.time(code.arrestAt)} · ${HEADER_STATUS[status]}`, alignment: 'right', fontSize: 8, color: GREY },
          ],
        },
      ],
    }),
    footer: (page: number, pages: number) => ({
      margin: [36, 12, 36, 0],
      columns: [
        {
          stack: [
            { text: `Record SHA-256: ${digest}`, fontSize: 7, color: GREY },
            { text: chainLine(input.chain), fontSize: 7, color: input.chain.valid ? GREY : '#000000', bold: !input.chain.valid },
            { text: integrityLine(input.integrity), fontSize: 7, color: input.integrity.valid ? GREY : '#000000', bold: !input.integrity.valid },
          ],
          width: '*',
        },
        { text: `Page ${page} of ${pages}`, fontSize: 8, alignment: 'right', width: 70 },
      ],
    }),
    ...(status === 'draft' ? { watermark: { text: 'DRAFT — not signed', opacity: 0.14, bold: true, fontSize: 64, color: '#000000' } } : {}),
    content,
    defaultStyle: { font: 'Atkinson', fontSize: 9, lineHeight: 1.15 },
    styles: {
      h1: { fontSize: 18, bold: true },
      h2: { fontSize: 12, bold: true },
      small: { fontSize: 8, color: GREY },
      legend: { fontSize: 7, color: GREY },
      marker: { fontSize: 7.5 },
      mono: { fontSize: 7, color: GREY },
    },
  };
}
