import type { CreateCodeRequest, NewEntry } from '@steadyhand/shared';

/**
 * Past codes of the demo hospital, so every after-the-code screen has something to show on a
 * fresh start: one ended and waiting for its signatures (the recorder's next job), and two signed
 * ones for the pharmacist and the reviewer. Patients, places and times are invented; the
 * clinical steps follow the usual adult and pediatric sequences and are demo data, not a source.
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
};

export const DEMO_CODES: readonly DemoCode[] = [fourWest, stepDown, fiveEast];
