import type { Code } from './codes.js';
import { csvCell } from './csv.js';
import type { CodeSummary } from './summary.js';
import type { FollowUp, UtsteinDetails } from './utstein.js';

/**
 * The registry export: one row per code with the Utstein in-hospital cardiac arrest elements
 * (Nolan JP et al., Utstein IHCA template update 2019, Resuscitation 2019 / Circulation
 * 2019;140:e746-e757; clinical sheet §4): the time points and figures from the log (through the
 * shared summary), the registry details completed at review (utstein.ts) and the reviewer's
 * follow-up. A coded detail reads as its API word ("yes", "cpc-1"...); "unknown" was entered as
 * unknown; an empty cell was never entered. Times are ISO 8601 in UTC; intervals are whole
 * seconds from arrest recognition. docs/utstein-export.md lists every column and value.
 */

export interface UtsteinColumn {
  name: string;
  description: string;
  /** Utstein IHCA 2019 group the element belongs to. */
  group: 'hospital' | 'patient' | 'pre-event' | 'process' | 'post-resuscitation' | 'outcome';
}

const YN = 'yes, no or unknown; empty when not entered';

export const UTSTEIN_CSV_COLUMNS = [
  { name: 'record_id', group: 'hospital', description: 'Steadyhand code id (UUID).' },
  { name: 'facility', group: 'hospital', description: 'Facility name from the settings.' },
  { name: 'unit', group: 'process', description: 'Unit (ward) where the arrest happened, or empty.' },
  { name: 'location', group: 'process', description: 'Free-text location (bed, room), or empty.' },
  { name: 'patient_category', group: 'patient', description: 'adult or pediatric.' },
  { name: 'patient_birth_date', group: 'patient', description: 'Date of birth, YYYY-MM-DD, or "unknown".' },
  { name: 'patient_sex', group: 'patient', description: 'male, female or unknown.' },
  { name: 'treatment_limitation_before_event', group: 'pre-event', description: 'none, dnacpr, other-limitation or unknown: a DNACPR or other treatment-limitation order in place before the arrest; empty when not entered.' },
  { name: 'witnessed', group: 'process', description: `Whether the arrest was witnessed: ${YN}.` },
  { name: 'witnessed_by', group: 'process', description: 'staff, other or unknown (only for a witnessed arrest); empty when not entered.' },
  { name: 'monitored', group: 'process', description: `Whether the patient was monitored when the arrest happened: ${YN}.` },
  { name: 'monitoring', group: 'process', description: 'The monitoring in place, joined with ";": ecg, pulse-oximetry, arterial-line; empty when not entered or not monitored.' },
  { name: 'arrest_location', group: 'process', description: 'ward, icu, ed, procedure-area, other or unknown; empty when not entered.' },
  { name: 'arrest_recognised_at', group: 'process', description: 'Time the arrest was recognised (ISO 8601, UTC).' },
  { name: 'team_arrived_at', group: 'process', description: 'Time the resuscitation team arrived, or empty.' },
  { name: 'pads_on_at', group: 'process', description: 'Time the defibrillator pads were on the patient, or empty.' },
  { name: 'cpr_started_at', group: 'process', description: 'Time chest compressions first started, or empty.' },
  { name: 'first_rhythm_analysis_at', group: 'process', description: 'Time of the first rhythm check, or empty.' },
  { name: 'first_defibrillation_at', group: 'process', description: 'Time of the first unsynchronised shock, or empty.' },
  { name: 'first_vasopressor_at', group: 'process', description: 'Time of the first epinephrine dose, or empty.' },
  { name: 'first_rosc_at', group: 'process', description: 'Time ROSC was first recorded, or empty.' },
  { name: 'event_ended_at', group: 'process', description: 'Time the event ended (ROSC sustained, or resuscitation stopped), or empty.' },
  { name: 'arrest_to_team_arrival_s', group: 'process', description: 'Seconds from recognition to the team\'s arrival (negative when the team was there first), or empty.' },
  { name: 'arrest_to_cpr_s', group: 'process', description: 'Seconds from recognition to the first compressions.' },
  { name: 'arrest_to_first_rhythm_analysis_s', group: 'process', description: 'Seconds from recognition to the first rhythm check.' },
  { name: 'arrest_to_first_defibrillation_s', group: 'process', description: 'Seconds from recognition to the first shock.' },
  { name: 'arrest_to_first_vasopressor_s', group: 'process', description: 'Seconds from recognition to the first epinephrine.' },
  { name: 'event_duration_s', group: 'process', description: 'Seconds from recognition to the end of the event.' },
  { name: 'first_documented_rhythm', group: 'process', description: 'VF, pVT, PEA (an organised rhythm without a pulse counts as PEA), asystole, organised (with a pulse), other, or unknown.' },
  { name: 'first_rhythm_shockable', group: 'process', description: 'yes (VF/pVT), no, or unknown.' },
  { name: 'cause', group: 'process', description: 'The cause as far as known: hypoxia, hypovolaemia, hypo-hyperkalaemia-metabolic, hypothermia, tension-pneumothorax, tamponade, toxins, coronary-thrombosis, pulmonary-thrombosis, other or unknown; empty when not entered.' },
  { name: 'cause_note', group: 'process', description: 'The cause in words when it is "other", or empty.' },
  { name: 'special_circumstances', group: 'process', description: 'pregnancy, trauma, drowning, anaphylaxis, hypothermia joined with ";", or none, or unknown; empty when not entered.' },
  { name: 'shocks', group: 'process', description: 'Number of shocks given (synchronised included).' },
  { name: 'epinephrine_doses', group: 'process', description: 'Number of epinephrine doses.' },
  { name: 'advanced_airway', group: 'process', description: 'Most advanced airway recorded: endotracheal, supraglottic, bag-mask, or none.' },
  { name: 'vascular_access', group: 'process', description: 'iv, io, iv+io, or none recorded.' },
  { name: 'compression_fraction', group: 'process', description: 'Compression fraction, 0 to 1 with 3 decimals (ROSC periods left out), or empty.' },
  { name: 'mechanical_cpr', group: 'process', description: `Mechanical chest compressions used: ${YN}.` },
  { name: 'ecpr', group: 'process', description: `Extracorporeal CPR started: ${YN}.` },
  { name: 'resuscitation_stopped_reason', group: 'process', description: 'rosc, futility, dnacpr-found, other or unknown; empty when not entered.' },
  { name: 'death_pronounced_at', group: 'process', description: 'Time death was pronounced, or empty.' },
  { name: 'death_pronounced_by', group: 'process', description: 'Who pronounced death (name as entered), or empty.' },
  { name: 'temperature_control', group: 'post-resuscitation', description: `Temperature control started after ROSC: ${YN}.` },
  { name: 'twelve_lead_ecg', group: 'post-resuscitation', description: '12-lead ECG after ROSC: st-elevation, no-st-elevation, not-done or unknown; empty when not entered.' },
  { name: 'handover_systolic_mmhg', group: 'post-resuscitation', description: 'Systolic blood pressure at hand-over, mmHg, or empty.' },
  { name: 'handover_diastolic_mmhg', group: 'post-resuscitation', description: 'Diastolic blood pressure at hand-over, mmHg, or empty.' },
  { name: 'handover_spo2_percent', group: 'post-resuscitation', description: 'SpO2 at hand-over, %, or empty.' },
  { name: 'handover_glucose', group: 'post-resuscitation', description: 'Blood glucose at hand-over, as entered, or empty.' },
  { name: 'handover_glucose_unit', group: 'post-resuscitation', description: 'mmol/L or mg/dL (UCUM mmol/L, mg/dL), or empty.' },
  { name: 'destination', group: 'post-resuscitation', description: 'Where the patient went: icu, cath-lab, operating-room, ward, other-hospital, other or unknown; empty when not entered.' },
  { name: 'any_rosc', group: 'outcome', description: 'yes or no: ROSC recorded at any time.' },
  { name: 'sustained_rosc', group: 'outcome', description: 'yes: ROSC for at least 20 min with no compressions; no: ROSC never reached or lost sooner; unknown: the code ended (care handed over) before 20 min of ROSC.' },
  { name: 'event_outcome', group: 'outcome', description: 'Outcome recorded at the end: sustained-rosc, rosc, died, transferred, other, or unknown.' },
  { name: 'survival_to_discharge', group: 'outcome', description: 'yes, no or unknown, from the reviewer\'s follow-up; empty when not entered.' },
  { name: 'survival_to_discharge_date', group: 'outcome', description: 'Day of discharge (yes) or of death in hospital (no), YYYY-MM-DD, or empty.' },
  { name: 'status_30_days', group: 'outcome', description: 'alive, dead or unknown at 30 days after the arrest; empty when not entered.' },
  { name: 'status_30_days_date', group: 'outcome', description: 'Day the 30-day status was found out (for dead: the day of death), or empty.' },
  { name: 'neurological_outcome', group: 'outcome', description: 'At discharge: cpc-1 to cpc-5 (Cerebral Performance Category) or mrs-0 to mrs-6 (modified Rankin Scale), or unknown; empty when not entered.' },
  { name: 'neurological_outcome_date', group: 'outcome', description: 'Day the neurological outcome was assessed, or empty.' },
  { name: 'follow_up_complete', group: 'outcome', description: 'yes when survival to discharge and the 30-day status are known and, for a survivor, the neurological outcome; else no.' },
] as const satisfies readonly UtsteinColumn[];

export type UtsteinColumnName = (typeof UTSTEIN_CSV_COLUMNS)[number]['name'];
export type UtsteinRow = Record<UtsteinColumnName, string>;

export interface UtsteinRowInput {
  code: Pick<Code, 'id' | 'category' | 'location' | 'patient'>;
  unitName: string | null;
  facility: string;
  summary: CodeSummary;
  /** The registry details as they read now (signed ones with their addenda applied). */
  utstein: UtsteinDetails;
  followUp: FollowUp | null;
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
const number = (v: number | undefined) => (v === undefined ? '' : String(v));
// Entered with any offset; exported in UTC like every other time.
const iso = (v: string) => new Date(v).toISOString();

export function utsteinRow(input: UtsteinRowInput): UtsteinRow {
  const { code, summary, utstein: d, followUp: f } = input;
  const teamArrival = d.teamArrivedAt ? (Date.parse(d.teamArrivedAt) - Date.parse(summary.times.arrestAt)) / 1000 : null;
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
    treatment_limitation_before_event: text(d.treatmentLimitation),
    witnessed: text(d.witnessed),
    witnessed_by: text(d.witnessedBy),
    monitored: text(d.monitored),
    monitoring: (d.monitoring ?? []).join(';'),
    arrest_location: text(d.arrestLocation),
    arrest_recognised_at: summary.times.arrestAt,
    team_arrived_at: text(d.teamArrivedAt && iso(d.teamArrivedAt)),
    pads_on_at: text(d.padsOnAt && iso(d.padsOnAt)),
    cpr_started_at: text(summary.times.firstCompressionsAt),
    first_rhythm_analysis_at: text(summary.times.firstRhythmAnalysisAt),
    first_defibrillation_at: text(summary.times.firstShockAt),
    first_vasopressor_at: text(summary.times.firstEpinephrineAt),
    first_rosc_at: text(summary.times.firstRoscAt),
    event_ended_at: text(summary.times.endedAt),
    arrest_to_team_arrival_s: seconds(teamArrival),
    arrest_to_cpr_s: seconds(summary.intervals.arrestToFirstCompressions),
    arrest_to_first_rhythm_analysis_s: seconds(summary.intervals.arrestToFirstRhythmAnalysis),
    arrest_to_first_defibrillation_s: seconds(summary.intervals.arrestToFirstShock),
    arrest_to_first_vasopressor_s: seconds(summary.intervals.arrestToFirstEpinephrine),
    event_duration_s: seconds(summary.durationSeconds),
    first_documented_rhythm: summary.firstRhythm ? (RHYTHM_WORDS[summary.firstRhythm] ?? summary.firstRhythm) : 'unknown',
    first_rhythm_shockable: summary.firstRhythmShockable === null ? 'unknown' : yesNo(summary.firstRhythmShockable),
    cause: text(d.cause),
    cause_note: text(d.causeNote),
    special_circumstances: (d.specialCircumstances ?? []).join(';'),
    shocks: String(summary.shocks.length),
    epinephrine_doses: String(summary.epinephrineDoses.length),
    advanced_airway: airway,
    vascular_access: access.size === 0 ? 'none' : [...access].sort().join('+'),
    compression_fraction: summary.compressionFraction === null ? '' : summary.compressionFraction.toFixed(3),
    mechanical_cpr: text(d.mechanicalCpr),
    ecpr: text(d.ecpr),
    resuscitation_stopped_reason: text(d.stopReason),
    death_pronounced_at: text(d.deathPronouncedAt && iso(d.deathPronouncedAt)),
    death_pronounced_by: text(d.deathPronouncedBy),
    temperature_control: text(d.temperatureControl),
    twelve_lead_ecg: text(d.twelveLeadEcg),
    handover_systolic_mmhg: number(d.handoverSystolicMmHg),
    handover_diastolic_mmhg: number(d.handoverDiastolicMmHg),
    handover_spo2_percent: number(d.handoverSpo2Percent),
    handover_glucose: number(d.handoverGlucose?.value),
    handover_glucose_unit: text(d.handoverGlucose?.unit),
    destination: text(d.destination),
    any_rosc: yesNo(summary.anyRosc),
    sustained_rosc: summary.sustainedRosc === null ? 'unknown' : yesNo(summary.sustainedRosc),
    event_outcome: summary.outcome ?? 'unknown',
    survival_to_discharge: text(f?.survivalToDischarge?.value),
    survival_to_discharge_date: text(f?.survivalToDischarge?.date),
    status_30_days: text(f?.status30Days?.value),
    status_30_days_date: text(f?.status30Days?.date),
    neurological_outcome: text(f?.neurologicalOutcome?.value),
    neurological_outcome_date: text(f?.neurologicalOutcome?.date),
    follow_up_complete: yesNo(f?.complete ?? false),
  };
}

/** The whole file: header line, then one line per code, CRLF line ends (RFC 4180). */
export function utsteinCsv(rows: readonly UtsteinRow[]): string {
  const names = UTSTEIN_CSV_COLUMNS.map((c) => c.name);
  const lines = [names.join(','), ...rows.map((r) => names.map((n) => csvCell(r[n])).join(','))];
  return lines.join('\r\n') + '\r\n';
}
