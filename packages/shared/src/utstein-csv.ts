import type { Code } from './codes.js';
import type { CodeSummary } from './summary.js';

/**
 * The registry export: one row per code with the Utstein in-hospital core elements that
 * Steadyhand records (Nolan JP et al., Utstein IHCA template update 2019, Resuscitation 2019 /
 * Circulation 2019;140:e746-e757; clinical sheet §4). Elements Steadyhand does not record
 * (witnessed, monitored, survival to discharge, neurological outcome) are still columns, left
 * as "unknown" or empty, so the registry's file shape never changes; fill them from the chart.
 * Times are ISO 8601 in UTC; intervals are whole seconds from arrest recognition.
 */

export interface UtsteinColumn {
  name: string;
  description: string;
  /** Utstein IHCA 2019 group the element belongs to. */
  group: 'hospital' | 'patient' | 'process' | 'outcome';
}

export const UTSTEIN_CSV_COLUMNS = [
  { name: 'record_id', group: 'hospital', description: 'Steadyhand code id (UUID).' },
  { name: 'facility', group: 'hospital', description: 'Facility name from the settings.' },
  { name: 'unit', group: 'process', description: 'Unit (ward) where the arrest happened, or empty.' },
  { name: 'location', group: 'process', description: 'Free-text location (bed, room), or empty.' },
  { name: 'patient_category', group: 'patient', description: 'adult or pediatric.' },
  { name: 'patient_birth_date', group: 'patient', description: 'Date of birth, YYYY-MM-DD, or "unknown".' },
  { name: 'patient_sex', group: 'patient', description: 'male, female or unknown.' },
  { name: 'witnessed', group: 'process', description: 'Not recorded by Steadyhand: always "unknown".' },
  { name: 'monitored', group: 'process', description: 'Not recorded by Steadyhand: always "unknown".' },
  { name: 'arrest_recognised_at', group: 'process', description: 'Time the arrest was recognised (ISO 8601, UTC).' },
  { name: 'cpr_started_at', group: 'process', description: 'Time chest compressions first started, or empty.' },
  { name: 'first_rhythm_analysis_at', group: 'process', description: 'Time of the first rhythm check, or empty.' },
  { name: 'first_defibrillation_at', group: 'process', description: 'Time of the first unsynchronised shock, or empty.' },
  { name: 'first_vasopressor_at', group: 'process', description: 'Time of the first epinephrine dose, or empty.' },
  { name: 'first_rosc_at', group: 'process', description: 'Time ROSC was first recorded, or empty.' },
  { name: 'event_ended_at', group: 'process', description: 'Time the event ended (ROSC sustained, or resuscitation stopped), or empty.' },
  { name: 'arrest_to_cpr_s', group: 'process', description: 'Seconds from recognition to the first compressions.' },
  { name: 'arrest_to_first_rhythm_analysis_s', group: 'process', description: 'Seconds from recognition to the first rhythm check.' },
  { name: 'arrest_to_first_defibrillation_s', group: 'process', description: 'Seconds from recognition to the first shock.' },
  { name: 'arrest_to_first_vasopressor_s', group: 'process', description: 'Seconds from recognition to the first epinephrine.' },
  { name: 'event_duration_s', group: 'process', description: 'Seconds from recognition to the end of the event.' },
  { name: 'first_documented_rhythm', group: 'process', description: 'VF, pVT, PEA (an organised rhythm without a pulse counts as PEA), asystole, organised (with a pulse), other, or unknown.' },
  { name: 'first_rhythm_shockable', group: 'process', description: 'yes (VF/pVT), no, or unknown.' },
  { name: 'shocks', group: 'process', description: 'Number of shocks given (synchronised included).' },
  { name: 'epinephrine_doses', group: 'process', description: 'Number of epinephrine doses.' },
  { name: 'advanced_airway', group: 'process', description: 'Most advanced airway recorded: endotracheal, supraglottic, bag-mask, or none.' },
  { name: 'vascular_access', group: 'process', description: 'iv, io, iv+io, or none recorded.' },
  { name: 'compression_fraction', group: 'process', description: 'Compression fraction, 0 to 1 with 3 decimals (ROSC periods left out), or empty.' },
  { name: 'any_rosc', group: 'outcome', description: 'yes or no: ROSC recorded at any time.' },
  { name: 'sustained_rosc', group: 'outcome', description: 'yes: ROSC for at least 20 min with no compressions; no: ROSC never reached or lost sooner; unknown: the code ended (care handed over) before 20 min of ROSC.' },
  { name: 'event_outcome', group: 'outcome', description: 'Outcome recorded at the end: sustained-rosc, died, transferred, other, or unknown.' },
  { name: 'survival_to_discharge', group: 'outcome', description: 'Not recorded by Steadyhand: always "unknown".' },
  { name: 'neurological_outcome', group: 'outcome', description: 'CPC or mRS at discharge; not recorded by Steadyhand: always empty.' },
] as const satisfies readonly UtsteinColumn[];

export type UtsteinColumnName = (typeof UTSTEIN_CSV_COLUMNS)[number]['name'];
export type UtsteinRow = Record<UtsteinColumnName, string>;

export interface UtsteinRowInput {
  code: Pick<Code, 'id' | 'category' | 'location' | 'patient'>;
  unitName: string | null;
  facility: string;
  summary: CodeSummary;
}

const RHYTHM_WORDS: Record<string, string> = {
  vf: 'VF',
  pvt: 'pVT',
  pea: 'PEA',
  asystole: 'asystole',
  organized: 'organised',
  other: 'other',
};

const text = (v: string | null | undefined) => v ?? '';
const seconds = (v: number | null) => (v === null ? '' : String(Math.round(v)));
const yesNo = (v: boolean) => (v ? 'yes' : 'no');

export function utsteinRow(input: UtsteinRowInput): UtsteinRow {
  const { code, summary } = input;
  const airways = new Set(summary.airway.map((a) => a.device));
  const access = new Set(summary.access.map((a) => a.route));
  const airway = (['endotracheal', 'supraglottic', 'bag-mask'] as const).find((a) => airways.has(a)) ?? 'none';
  return {
    record_id: code.id,
    facility: input.facility,
    unit: text(input.unitName),
    location: text(code.location),
    patient_category: code.category,
    patient_birth_date: code.patient?.birthDate ?? 'unknown',
    patient_sex: code.patient?.sex ?? 'unknown',
    witnessed: 'unknown',
    monitored: 'unknown',
    arrest_recognised_at: summary.times.arrestAt,
    cpr_started_at: text(summary.times.firstCompressionsAt),
    first_rhythm_analysis_at: text(summary.times.firstRhythmAnalysisAt),
    first_defibrillation_at: text(summary.times.firstShockAt),
    first_vasopressor_at: text(summary.times.firstEpinephrineAt),
    first_rosc_at: text(summary.times.firstRoscAt),
    event_ended_at: text(summary.times.endedAt),
    arrest_to_cpr_s: seconds(summary.intervals.arrestToFirstCompressions),
    arrest_to_first_rhythm_analysis_s: seconds(summary.intervals.arrestToFirstRhythmAnalysis),
    arrest_to_first_defibrillation_s: seconds(summary.intervals.arrestToFirstShock),
    arrest_to_first_vasopressor_s: seconds(summary.intervals.arrestToFirstEpinephrine),
    event_duration_s: seconds(summary.durationSeconds),
    first_documented_rhythm: summary.firstRhythm ? (RHYTHM_WORDS[summary.firstRhythm] ?? summary.firstRhythm) : 'unknown',
    first_rhythm_shockable: summary.firstRhythmShockable === null ? 'unknown' : yesNo(summary.firstRhythmShockable),
    shocks: String(summary.shocks.length),
    epinephrine_doses: String(summary.epinephrineDoses.length),
    advanced_airway: airway,
    vascular_access: access.size === 0 ? 'none' : [...access].sort().join('+'),
    compression_fraction: summary.compressionFraction === null ? '' : summary.compressionFraction.toFixed(3),
    any_rosc: yesNo(summary.anyRosc),
    sustained_rosc: summary.sustainedRosc === null ? 'unknown' : yesNo(summary.sustainedRosc),
    event_outcome: summary.outcome ?? 'unknown',
    survival_to_discharge: 'unknown',
    neurological_outcome: '',
  };
}

/**
 * RFC 4180 field: quoted when it holds a comma, quote, CR or LF; quotes doubled. A leading
 * =, +, - or @ gets a quote mark first, so a spreadsheet never runs a cell as a formula.
 */
export function csvField(value: string): string {
  const safe = /^[=+\-@\t\r]/.test(value) && !/^-?\d/.test(value) ? `'${value}` : value;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** The whole file: header line, then one line per code, CRLF line ends (RFC 4180). */
export function utsteinCsv(rows: readonly UtsteinRow[]): string {
  const names = UTSTEIN_CSV_COLUMNS.map((c) => c.name);
  const lines = [names.join(','), ...rows.map((r) => names.map((n) => csvField(r[n])).join(','))];
  return lines.join('\r\n') + '\r\n';
}
