import type { CreateCodeRequest, FollowUpRequest, NewEntry, UtsteinDetails } from '@steadyhand/shared';

/**
 * Past codes of the demo hospital, so every after-the-code screen has something to show on a
 * fresh start: one ended and waiting for its signatures and registry details (the recorder's next
 * job), and four signed ones over three months and four units for the pharmacist and the reviewer,
 * with registry details and, for some, the follow-up after discharge. Patients, places and times
 * are invented; the clinical steps follow the usual adult and pediatric sequences and are demo
 * data, not a source.
 */

type NoBase<T> = T extends unknown ? Omit<T, 'id' | 'at'> : never;
export type DemoStep = [secondsFromArrest: number, entry: NoBase<NewEntry>];

export interface DemoCode {
  /** Days before the day the demo is loaded; the arrest is at `clock` local time that day. */
  daysAgo: number;
  clock: [hours: number, minutes: number, seconds: number];
  unit: string;
  details: Omit<CreateCodeRequest, 'arrestAt' | 'id' | 'unitId'> & {
    category: 'adult' | 'pediatric';
  };
  /** Who recorded (a demo username); the device's name. */
  recordedBy: string;
  deviceId: string;
  steps: DemoStep[];
  /** Which signatures the demo loads: none leaves the record for the recorder to sign. */
  signedBy: { recorder?: string; leader?: string };
  team: { name: string; role: string }[];
  debriefNotes?: string;
  /**
   * Registry details entered at review (before signing). Times are seconds from the arrest
   * (negative: before it) and become date-times when the demo is loaded.
   */
  utstein?: Omit<UtsteinDetails, 'teamArrivedAt' | 'padsOnAt' | 'deathPronouncedAt'> & { teamArrivedAt?: number; padsOnAt?: number; deathPronouncedAt?: number };
  /** The reviewer's follow-up; dates are days after the arrest. */
  followUp?: {
    survivalToDischarge: NonNullable<FollowUpRequest['survivalToDischarge']>;
    survivalDay?: number;
    status30Days?: NonNullable<FollowUpRequest['status30Days']>;
    status30Day?: number;
    neurologicalOutcome?: NonNullable<FollowUpRequest['neurologicalOutcome']>;
    neurologicalOutcomeDay?: number;
  };
}

const hms = (h: number, m: number, s: number) => h * 3600 + m * 60 + s;

/** The brief's code, in 4 West bed 12: arrest 07:42:10, ended 08:05. Waiting to be signed. */
const fourWest: DemoCode = {
  daysAgo: 1,
  clock: [7, 42, 10],
  unit: '4 West Medical',
  details: {
    category: 'adult',
    location: '4 West Medical, bed 12',
    patient: { name: 'Rowan Pellegrini', mrn: 'HG-204817', sex: 'male', birthDate: '1958-09-14' },
  },
  recordedBy: 'maren.holt',
  deviceId: 'tablet-4w',
  steps: [
    [hms(0, 0, 15), { kind: 'cpr', action: 'start' }],
    [hms(0, 1, 28), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 1, 30), { kind: 'rhythm', rhythm: 'vf', pulse: false }],
    [hms(0, 1, 35), { kind: 'shock', joules: 200, synchronized: false }],
    [hms(0, 1, 37), { kind: 'cpr', action: 'start' }],
    [hms(0, 2, 40), { kind: 'access', route: 'iv', site: 'left antecubital' }],
    [hms(0, 3, 37), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 3, 40), { kind: 'rhythm', rhythm: 'vf', pulse: false }],
    [hms(0, 3, 44), { kind: 'shock', joules: 200, synchronized: false }],
    [hms(0, 3, 46), { kind: 'cpr', action: 'start' }],
    [hms(0, 5, 45), { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' }],
    [hms(0, 5, 50), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 5, 52), { kind: 'rhythm', rhythm: 'vf', pulse: false }],
    [hms(0, 5, 56), { kind: 'shock', joules: 200, synchronized: false }],
    [hms(0, 5, 58), { kind: 'cpr', action: 'start' }],
    [hms(0, 6, 30), { kind: 'drug', drug: 'amiodarone', dose: 300, unit: 'mg', route: 'iv' }],
    [
      hms(0, 7, 10),
      { kind: 'airway', device: 'endotracheal', confirmation: 'waveform-capnography' },
    ],
    [hms(0, 7, 30), { kind: 'etco2', mmHg: 18 }],
    [hms(0, 8, 0), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 8, 3), { kind: 'rhythm', rhythm: 'pea', pulse: false }],
    [hms(0, 8, 5), { kind: 'cpr', action: 'start' }],
    [hms(0, 10, 5), { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' }],
    [hms(0, 12, 5), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 12, 8), { kind: 'rhythm', rhythm: 'vf', pulse: false }],
    [hms(0, 12, 12), { kind: 'shock', joules: 200, synchronized: false }],
    [hms(0, 12, 14), { kind: 'cpr', action: 'start' }],
    [hms(0, 13, 0), { kind: 'drug', drug: 'amiodarone', dose: 150, unit: 'mg', route: 'iv' }],
    [hms(0, 14, 15), { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' }],
    [hms(0, 16, 15), { kind: 'cpr', action: 'stop', reason: 'rosc' }],
    [hms(0, 16, 20), { kind: 'rosc' }],
    [hms(0, 16, 40), { kind: 'etco2', mmHg: 38 }],
    [hms(0, 22, 50), { kind: 'end', outcome: 'transferred' }],
  ],
  signedBy: {},
  team: [],
  // Where and when the team came are in; witnessed and monitored are for the recorder to complete.
  utstein: { arrestLocation: 'ward', teamArrivedAt: 75 },
};

/** An asystole code on the step-down unit; signed by both, ready for the pharmacy and review. */
const stepDown: DemoCode = {
  daysAgo: 3,
  clock: [14, 5, 0],
  unit: 'Cardiac Step-Down 3B',
  details: {
    category: 'adult',
    location: 'Cardiac Step-Down 3B, room 7',
    patient: { name: 'Hester Quainton', mrn: 'HG-118342', sex: 'female', birthDate: '1941-02-03' },
  },
  recordedBy: 'maren.holt',
  deviceId: 'tablet-3b',
  steps: [
    [hms(0, 0, 20), { kind: 'cpr', action: 'start' }],
    [hms(0, 1, 50), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 1, 53), { kind: 'rhythm', rhythm: 'asystole', pulse: false }],
    [hms(0, 1, 56), { kind: 'cpr', action: 'start' }],
    [hms(0, 3, 10), { kind: 'access', route: 'io', site: 'right proximal tibia' }],
    [hms(0, 3, 40), { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'io' }],
    [hms(0, 3, 56), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 3, 59), { kind: 'rhythm', rhythm: 'asystole', pulse: false }],
    [hms(0, 4, 1), { kind: 'cpr', action: 'swap' }],
    [hms(0, 4, 2), { kind: 'cpr', action: 'start' }],
    [hms(0, 7, 45), { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'io' }],
    [hms(0, 8, 0), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 8, 4), { kind: 'rhythm', rhythm: 'pea', pulse: false }],
    [hms(0, 8, 6), { kind: 'cpr', action: 'start' }],
    [
      hms(0, 9, 0),
      { kind: 'drug', drug: 'sodium-bicarbonate', dose: 50, unit: 'meq', route: 'io' },
    ],
    [hms(0, 11, 50), { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'io' }],
    [hms(0, 12, 6), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 12, 9), { kind: 'rhythm', rhythm: 'asystole', pulse: false }],
    [
      hms(0, 12, 20),
      {
        kind: 'note',
        text: 'Family present; team agreed to stop after discussion with the family.',
      },
    ],
    [hms(0, 13, 0), { kind: 'end', outcome: 'died' }],
  ],
  signedBy: { recorder: 'maren.holt', leader: 'kofi.asante' },
  team: [
    { name: 'Dr Kofi Asante', role: 'Team leader' },
    { name: 'Maren Holt, RN', role: 'Recorder' },
    { name: 'Tobias Wren, RN', role: 'Compressions' },
    { name: 'Dr Amara Lindqvist', role: 'Airway' },
  ],
  debriefNotes:
    'IO access placed quickly after two failed IV attempts. Next time: call for the IO kit with the cart.',
  utstein: {
    witnessed: 'yes',
    witnessedBy: 'staff',
    monitored: 'yes',
    monitoring: ['ecg'],
    arrestLocation: 'ward',
    teamArrivedAt: 70,
    padsOnAt: 95,
    cause: 'unknown',
    specialCircumstances: ['none'],
    treatmentLimitation: 'none',
    mechanicalCpr: 'no',
    ecpr: 'no',
    stopReason: 'futility',
    deathPronouncedAt: hms(0, 13, 0),
    deathPronouncedBy: 'Dr Kofi Asante',
  },
  followUp: { survivalToDischarge: 'no', survivalDay: 0, status30Days: 'dead', status30Day: 0, neurologicalOutcome: 'cpc-5', neurologicalOutcomeDay: 0 },
};

/** A pediatric VF code (18 kg) on 5 East; signed by both. Doses follow the weight. */
const fiveEast: DemoCode = {
  daysAgo: 9,
  clock: [22, 17, 30],
  unit: 'Pediatric Ward 5 East',
  details: {
    category: 'pediatric',
    weightKg: 18,
    weightSource: 'measured',
    location: 'Pediatric Ward 5 East, bed 3',
    patient: { name: 'Ilse Marchetti', mrn: 'HG-330571', sex: 'female', birthDate: '2020-06-21' },
  },
  recordedBy: 'maren.holt',
  deviceId: 'tablet-5e',
  steps: [
    [hms(0, 0, 10), { kind: 'cpr', action: 'start' }],
    [hms(0, 1, 15), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 1, 17), { kind: 'rhythm', rhythm: 'vf', pulse: false }],
    [hms(0, 1, 22), { kind: 'shock', joules: 36, synchronized: false }],
    [hms(0, 1, 24), { kind: 'cpr', action: 'start' }],
    [hms(0, 2, 30), { kind: 'access', route: 'io', site: 'left proximal tibia' }],
    [hms(0, 3, 24), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 3, 26), { kind: 'rhythm', rhythm: 'vf', pulse: false }],
    [hms(0, 3, 30), { kind: 'shock', joules: 72, synchronized: false }],
    [hms(0, 3, 32), { kind: 'cpr', action: 'start' }],
    [hms(0, 4, 0), { kind: 'drug', drug: 'epinephrine', dose: 0.18, unit: 'mg', route: 'io' }],
    [hms(0, 5, 32), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 5, 34), { kind: 'rhythm', rhythm: 'vf', pulse: false }],
    [hms(0, 5, 38), { kind: 'shock', joules: 72, synchronized: false }],
    [hms(0, 5, 40), { kind: 'cpr', action: 'start' }],
    [hms(0, 6, 10), { kind: 'drug', drug: 'amiodarone', dose: 90, unit: 'mg', route: 'io' }],
    [hms(0, 7, 40), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 7, 43), { kind: 'rhythm', rhythm: 'organized', pulse: true }],
    [hms(0, 7, 45), { kind: 'rosc' }],
    [hms(0, 30, 0), { kind: 'end', outcome: 'rosc' }],
  ],
  signedBy: { recorder: 'maren.holt', leader: 'kofi.asante' },
  team: [
    { name: 'Dr Kofi Asante', role: 'Team leader' },
    { name: 'Maren Holt, RN', role: 'Recorder' },
    { name: 'Noor Haddad, RN', role: 'Medications' },
  ],
  debriefNotes:
    'Weight from the ward chart (18 kg) was on the wall from the start; doses double-checked aloud.',
  // Still in hospital: no follow-up yet, so the reviewer's follow-up list has it.
  utstein: {
    witnessed: 'yes',
    witnessedBy: 'staff',
    monitored: 'no',
    arrestLocation: 'ward',
    teamArrivedAt: 95,
    padsOnAt: 70,
    cause: 'other',
    causeNote: 'Suspected myocarditis',
    specialCircumstances: ['none'],
    treatmentLimitation: 'none',
    mechanicalCpr: 'no',
    ecpr: 'no',
    stopReason: 'rosc',
    temperatureControl: 'yes',
    twelveLeadEcg: 'no-st-elevation',
    handoverSystolicMmHg: 92,
    handoverDiastolicMmHg: 58,
    handoverSpo2Percent: 97,
    handoverGlucose: { value: 6.1, unit: 'mmol/L' },
    destination: 'icu',
  },
};

/** A monitored VF arrest in the emergency department, shocked at 50 s; to the cath lab, home on day 11. */
const emergencyBay: DemoCode = {
  daysAgo: 41,
  clock: [10, 20, 0],
  unit: 'Emergency Bay 2',
  details: {
    category: 'adult',
    location: 'Emergency Bay 2, resuscitation bay 1',
    patient: { name: 'Callum Oduya', mrn: 'HG-402219', sex: 'male', birthDate: '1967-04-02' },
  },
  recordedBy: 'maren.holt',
  deviceId: 'tablet-ed',
  steps: [
    [hms(0, 0, 10), { kind: 'cpr', action: 'start' }],
    [hms(0, 0, 40), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 0, 42), { kind: 'rhythm', rhythm: 'vf', pulse: false }],
    [hms(0, 0, 50), { kind: 'shock', joules: 200, synchronized: false }],
    [hms(0, 0, 52), { kind: 'cpr', action: 'start' }],
    [hms(0, 1, 30), { kind: 'access', route: 'iv', site: 'right antecubital' }],
    [hms(0, 2, 52), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 2, 55), { kind: 'rhythm', rhythm: 'vf', pulse: false }],
    [hms(0, 3, 0), { kind: 'shock', joules: 200, synchronized: false }],
    [hms(0, 3, 2), { kind: 'cpr', action: 'start' }],
    [hms(0, 4, 0), { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' }],
    [hms(0, 4, 20), { kind: 'airway', device: 'supraglottic', confirmation: 'waveform-capnography' }],
    [hms(0, 5, 2), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 5, 5), { kind: 'rhythm', rhythm: 'organized', pulse: true }],
    [hms(0, 5, 6), { kind: 'rosc' }],
    [hms(0, 5, 40), { kind: 'etco2', mmHg: 41 }],
    [hms(0, 28, 0), { kind: 'end', outcome: 'rosc' }],
  ],
  signedBy: { recorder: 'maren.holt', leader: 'kofi.asante' },
  team: [
    { name: 'Dr Kofi Asante', role: 'Team leader' },
    { name: 'Maren Holt, RN', role: 'Recorder' },
  ],
  debriefNotes: 'Pads were on from triage; first shock under a minute. Cath lab called from the bay.',
  utstein: {
    witnessed: 'yes',
    witnessedBy: 'staff',
    monitored: 'yes',
    monitoring: ['ecg', 'pulse-oximetry'],
    arrestLocation: 'ed',
    teamArrivedAt: 60,
    padsOnAt: -900,
    cause: 'coronary-thrombosis',
    specialCircumstances: ['none'],
    treatmentLimitation: 'none',
    mechanicalCpr: 'no',
    ecpr: 'no',
    stopReason: 'rosc',
    temperatureControl: 'yes',
    twelveLeadEcg: 'st-elevation',
    handoverSystolicMmHg: 104,
    handoverDiastolicMmHg: 66,
    handoverSpo2Percent: 96,
    handoverGlucose: { value: 9.1, unit: 'mmol/L' },
    destination: 'cath-lab',
  },
  followUp: { survivalToDischarge: 'yes', survivalDay: 11, status30Days: 'alive', status30Day: 31, neurologicalOutcome: 'cpc-1', neurologicalOutcomeDay: 11 },
};

/** PEA in intensive care with an arterial line, ROSC twice; died in hospital on day 6. */
const sixNorth: DemoCode = {
  daysAgo: 76,
  clock: [3, 12, 0],
  unit: 'Intensive Care 6 North',
  details: {
    category: 'adult',
    location: 'Intensive Care 6 North, bed 4',
    patient: { name: 'Marguerite Sallow', mrn: 'HG-287740', sex: 'female', birthDate: '1949-11-30' },
  },
  recordedBy: 'maren.holt',
  deviceId: 'tablet-6n',
  steps: [
    [hms(0, 0, 5), { kind: 'cpr', action: 'start' }],
    [hms(0, 1, 0), { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' }],
    [hms(0, 2, 5), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 2, 8), { kind: 'rhythm', rhythm: 'pea', pulse: false }],
    [hms(0, 2, 10), { kind: 'cpr', action: 'start' }],
    [hms(0, 5, 0), { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' }],
    [hms(0, 6, 10), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 6, 12), { kind: 'rhythm', rhythm: 'organized', pulse: true }],
    [hms(0, 6, 14), { kind: 'rosc' }],
    [hms(0, 9, 30), { kind: 'rearrest' }],
    [hms(0, 9, 32), { kind: 'cpr', action: 'start' }],
    [hms(0, 10, 0), { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' }],
    [hms(0, 11, 32), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
    [hms(0, 11, 35), { kind: 'rhythm', rhythm: 'organized', pulse: true }],
    [hms(0, 11, 36), { kind: 'rosc' }],
    [hms(0, 35, 0), { kind: 'end', outcome: 'rosc' }],
  ],
  signedBy: { recorder: 'maren.holt', leader: 'kofi.asante' },
  team: [
    { name: 'Dr Amara Lindqvist', role: 'Team leader' },
    { name: 'Maren Holt, RN', role: 'Recorder' },
    { name: 'Tobias Wren, RN', role: 'Compressions' },
  ],
  debriefNotes: 'Arterial line showed the loss of pressure at once. Blood products started during the second ROSC.',
  utstein: {
    witnessed: 'yes',
    witnessedBy: 'staff',
    monitored: 'yes',
    monitoring: ['ecg', 'pulse-oximetry', 'arterial-line'],
    arrestLocation: 'icu',
    teamArrivedAt: 90,
    cause: 'hypovolaemia',
    specialCircumstances: ['none'],
    treatmentLimitation: 'none',
    mechanicalCpr: 'no',
    ecpr: 'no',
    stopReason: 'rosc',
    temperatureControl: 'yes',
    twelveLeadEcg: 'no-st-elevation',
    handoverSystolicMmHg: 88,
    handoverDiastolicMmHg: 52,
    handoverSpo2Percent: 94,
    handoverGlucose: { value: 12.4, unit: 'mmol/L' },
    destination: 'icu',
  },
  followUp: { survivalToDischarge: 'no', survivalDay: 6, status30Days: 'dead', status30Day: 6, neurologicalOutcome: 'cpc-5', neurologicalOutcomeDay: 6 },
};

export const DEMO_CODES: readonly DemoCode[] = [fourWest, stepDown, fiveEast, emergencyBay, sixNorth];
