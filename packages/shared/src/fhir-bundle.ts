import type { Code } from './codes.js';
import type { DoseUnit } from './entries.js';
import type { SignatureMeaning } from './records.js';
import { OUTCOME_WORDS } from './state-words.js';
import type { CodeSummary } from './summary.js';
import type { Timeline } from './timeline.js';
import {
  NEUROLOGICAL_OUTCOME_WORDS,
  STATUS_30_DAYS_WORDS,
  SURVIVAL_WORDS,
  UTSTEIN_FIELD_LABELS,
  utsteinValueText,
  type FollowUp,
  type UtsteinDetails,
  type UtsteinField,
} from './utstein.js';

/**
 * One signed code as an HL7 FHIR R4 document Bundle, for the hospital record system. Pure: the
 * caller hands in the record and a UUID maker. Resources and codes follow the clinical sheet §5
 * (hl7.org/fhir/R4); each code below names its source and how sure the sheet is of it.
 */

export const FHIR_SYSTEMS = {
  snomed: 'http://snomed.info/sct',
  loinc: 'http://loinc.org',
  rxnorm: 'http://www.nlm.nih.gov/research/umls/rxnorm',
  ucum: 'http://unitsofmeasure.org',
  observationCategory: 'http://terminology.hl7.org/CodeSystem/observation-category',
  actCode: 'http://terminology.hl7.org/CodeSystem/v3-ActCode',
  // ASTM E1762 signature types, the FHIR R4 signature-type value set (from memory).
  signatureType: 'urn:iso-astm:E1762-95:2013',
} as const;

/** SNOMED CT, clinical sheet §5b (confirmed secondary). */
export const SNOMED = {
  cardiacArrest: { code: '410429000', display: 'Cardiac arrest' }, // EMS Condition profile; BioPortal
  cpr: { code: '89666000', display: 'Cardiopulmonary resuscitation' }, // TraumaIG example
  defibrillation: { code: '426220008', display: 'External ventricular defibrillation' }, // FSH example; NEMSIS map
} as const;

/**
 * Airway and vascular access procedures: SNOMED CT codes from a public NEMSIS mapping (clinical
 * sheet §5b: confirmed secondary, labels unverified), so they carry no display of ours; the text
 * says what was done.
 */
export const SNOMED_PROCEDURES = {
  endotracheal: '232674004', // "orotracheal intubation" in the mapping
  supraglottic: '424979004', // "supraglottic airway"
  'bag-mask': '425447009', // "BVM ventilation"
  iv: '392230005', // "IV insertion"
  io: '430824005', // "IO insertion"
} as const;

/**
 * LOINC codes for the hand-over vital signs and glucose. From memory (not in the clinical
 * sheet): check on loinc.org before a receiving system relies on them.
 */
export const LOINC_VITALS = {
  bloodPressurePanel: { code: '85354-9', display: 'Blood pressure panel with all children optional' },
  systolic: { code: '8480-6', display: 'Systolic blood pressure' },
  diastolic: { code: '8462-4', display: 'Diastolic blood pressure' },
  spo2: { code: '59408-5', display: 'Oxygen saturation in Arterial blood by Pulse oximetry' },
  glucoseMass: { code: '2339-0', display: 'Glucose [Mass/volume] in Blood' },
  glucoseMoles: { code: '15074-8', display: 'Glucose [Moles/volume] in Blood' },
} as const;

/** LOINC 19891-1 ETCO2 (German MII ICU profile, clinical sheet §5b, confirmed secondary). */
export const LOINC_ETCO2 = { code: '19891-1', display: 'Carbon dioxide [Partial pressure] in Exhaled gas --at end expiration' } as const;

/**
 * RxNorm ingredient RxCUIs by catalogue key (clinical sheet §5b: confirmed secondary, "check each
 * on RxNav"; adenosine 296 from memory).
 */
export const RXNORM_BY_DRUG: Readonly<Record<string, { code: string; display: string; fromMemory?: true }>> = {
  epinephrine: { code: '3992', display: 'Epinephrine' },
  amiodarone: { code: '703', display: 'Amiodarone' },
  lidocaine: { code: '6387', display: 'Lidocaine' },
  atropine: { code: '1223', display: 'Atropine' },
  'calcium-chloride': { code: '1901', display: 'Calcium Chloride' },
  'sodium-bicarbonate': { code: '36676', display: 'Sodium Bicarbonate' },
  'magnesium-sulfate': { code: '6585', display: 'Magnesium Sulfate' },
  adenosine: { code: '296', display: 'Adenosine', fromMemory: true },
};

/** UCUM codes (case-sensitive) and what people read, clinical sheet §5c. */
export const UCUM_DOSE: Record<DoseUnit, { code: string; unit: string }> = {
  mg: { code: 'mg', unit: 'mg' },
  ug: { code: 'ug', unit: 'microgram' },
  g: { code: 'g', unit: 'g' },
  meq: { code: 'meq', unit: 'mEq' },
  mL: { code: 'mL', unit: 'mL' },
};

const SIGNATURE_TYPE: Record<SignatureMeaning, { code: string; display: string }> = {
  'recorded-by': { code: '1.2.840.10065.1.12.1.1', display: "Author's Signature" },
  'reviewed-confirmed': { code: '1.2.840.10065.1.12.1.5', display: 'Verification Signature' },
};

const ROUTE_TEXT: Record<string, string> = { iv: 'Intravenous', io: 'Intraosseous', et: 'Endotracheal', other: 'Other' };
const RHYTHM_TEXT: Record<string, string> = {
  vf: 'Ventricular fibrillation (VF)',
  pvt: 'Pulseless ventricular tachycardia (pVT)',
  pea: 'Pulseless electrical activity (PEA)',
  asystole: 'Asystole',
  organized: 'Organised rhythm',
  other: 'Other rhythm',
};

export interface FhirSignatureInput {
  printedName: string;
  meaning: SignatureMeaning;
  signedAt: string;
  /** The server's Ed25519 signature, base64url. */
  serverSignature?: string;
}

export interface FhirBundleInput {
  code: Pick<Code, 'id' | 'arrestAt' | 'endedAt' | 'location' | 'patient' | 'category'>;
  /** The code's folded log (the same one the summary was made from). */
  timeline: Timeline;
  summary: CodeSummary;
  /** The registry details as they read now; a field not entered or entered as unknown is left out. */
  utstein?: UtsteinDetails;
  /** The reviewer's follow-up; an answer not entered or unknown is left out. */
  followUp?: FollowUp | null;
  signatures: readonly FhirSignatureInput[];
  facility: string;
  unitName: string | null;
  /** When the bundle is made (Bundle.timestamp, Composition.date). */
  generatedAt: string;
  /** A new UUID each call (crypto.randomUUID on the server). */
  newId: () => string;
}

type Json = Record<string, unknown>;
export interface FhirBundle extends Json {
  resourceType: 'Bundle';
  type: 'document';
  entry: { fullUrl: string; resource: Json & { resourceType: string; id: string } }[];
}

const urn = (id: string) => `urn:uuid:${id}`;
// FHIR base64Binary is plain base64; our signatures are base64url.
const base64 = (b64url: string) => {
  const s = b64url.replace(/-/g, '+').replace(/_/g, '/');
  return s + '='.repeat((4 - (s.length % 4)) % 4);
};

export function buildFhirBundle(input: FhirBundleInput): FhirBundle {
  const { code, summary, newId } = input;
  const { timeline } = input;
  const at = (e: { atMs: number }) => new Date(e.atMs).toISOString();
  const resources: (Json & { resourceType: string; id: string })[] = [];
  const add = <T extends Json & { resourceType: string; id: string }>(r: T): T => {
    resources.push(r);
    return r;
  };

  const patientId = newId();
  const encounterId = newId();
  const compositionId = newId();
  const subject = { reference: urn(patientId) };
  const encounter = { reference: urn(encounterId) };
  const where = [input.unitName, code.location].filter(Boolean).join(', ');

  const p = code.patient;
  const d: UtsteinDetails = input.utstein ?? {};
  const f = input.followUp ?? null;
  // Only a death that was recorded: pronounced at the code, or in hospital or by day 30 with its day.
  const deceased =
    d.deathPronouncedAt ??
    (f?.survivalToDischarge?.value === 'no' ? f.survivalToDischarge.date : null) ??
    (f?.status30Days?.value === 'dead' ? f.status30Days.date : null);
  add({
    resourceType: 'Patient',
    id: patientId,
    ...(p?.mrn ? { identifier: [{ type: { text: 'Medical record number' }, value: p.mrn }] } : {}),
    ...(p?.name ? { name: [{ text: p.name }] } : {}),
    gender: p?.sex ?? 'unknown',
    ...(p?.birthDate ? { birthDate: p.birthDate } : {}),
    ...(deceased ? { deceasedDateTime: deceased } : {}),
  });
  add({
    resourceType: 'Encounter',
    id: encounterId,
    status: 'finished',
    // v3 ActCode IMP "inpatient encounter" (R4 Encounter.class is required; from memory).
    class: { system: FHIR_SYSTEMS.actCode, code: 'IMP', display: 'inpatient encounter' },
    type: [{ text: `In-hospital cardiac arrest (${code.category})` }],
    subject,
    period: { start: summary.times.arrestAt, ...(summary.times.endedAt ? { end: summary.times.endedAt } : {}) },
    ...(where ? { location: [{ location: { display: where } }] } : {}),
    serviceProvider: { display: input.facility },
  });
  const condition = add({
    resourceType: 'Condition',
    id: newId(),
    code: { coding: [{ system: FHIR_SYSTEMS.snomed, ...SNOMED.cardiacArrest }], text: 'Cardiac arrest' },
    subject,
    encounter,
    onsetDateTime: summary.times.arrestAt,
  });

  const procedures: string[] = [];
  if (summary.times.firstCompressionsAt) {
    const cf = summary.compressionFraction;
    const cpr = add({
      resourceType: 'Procedure',
      id: newId(),
      status: 'completed',
      code: { coding: [{ system: FHIR_SYSTEMS.snomed, ...SNOMED.cpr }], text: 'Chest compressions (CPR)' },
      subject,
      encounter,
      performedPeriod: { start: summary.times.firstCompressionsAt, end: summary.horizonAt },
      reasonReference: [{ reference: urn(condition.id) }],
      ...(cf !== null
        ? { note: [{ text: `Compression fraction ${Math.round(cf * 100)}%; ${summary.pauses.length} pauses, longest ${Math.round(summary.longestPause?.seconds ?? 0)} s.` }] }
        : {}),
    });
    procedures.push(cpr.id);
  }
  for (const e of timeline.shocks) {
    const text = e.synchronized ? 'Synchronised cardioversion' : 'Defibrillation (unsynchronised shock)';
    add({
      resourceType: 'Procedure',
      id: e.id,
      status: 'completed',
      // 426220008 is defibrillation; the sheet gives no cardioversion code, so a synchronised shock is text only.
      code: e.synchronized ? { text } : { coding: [{ system: FHIR_SYSTEMS.snomed, ...SNOMED.defibrillation }], text },
      subject,
      encounter,
      performedDateTime: at(e),
      note: [{ text: `${e.joules} J, ${e.synchronized ? 'synchronised' : 'unsynchronised'}` }],
    });
    procedures.push(e.id);
  }

  for (const e of timeline.airway) {
    const words = { endotracheal: 'Endotracheal tube', supraglottic: 'Supraglottic airway', 'bag-mask': 'Bag-mask ventilation' }[e.device];
    add({
      resourceType: 'Procedure',
      id: e.id,
      status: 'completed',
      category: { text: 'Airway' },
      code: { coding: [{ system: FHIR_SYSTEMS.snomed, code: SNOMED_PROCEDURES[e.device] }], text: words },
      subject,
      encounter,
      performedDateTime: new Date(e.at).toISOString(),
      ...(e.confirmation ? { note: [{ text: `Confirmed by ${e.confirmation.replace(/-/g, ' ')}` }] } : {}),
    });
    procedures.push(e.id);
  }
  for (const e of timeline.access) {
    add({
      resourceType: 'Procedure',
      id: e.id,
      status: 'completed',
      category: { text: 'Vascular access' },
      code: { coding: [{ system: FHIR_SYSTEMS.snomed, code: SNOMED_PROCEDURES[e.route] }], text: e.route === 'iv' ? 'Intravenous access' : 'Intraosseous access' },
      subject,
      encounter,
      performedDateTime: new Date(e.at).toISOString(),
      ...(e.site ? { bodySite: [{ text: e.site }] } : {}),
    });
    procedures.push(e.id);
  }
  // Yes is a completed procedure, no a procedure not done; unknown or not entered is left out.
  const yesNoProcedure = (answer: string | undefined, text: string) => {
    if (answer !== 'yes' && answer !== 'no') return;
    const proc = add({ resourceType: 'Procedure', id: newId(), status: answer === 'yes' ? 'completed' : 'not-done', code: { text }, subject, encounter });
    procedures.push(proc.id);
  };
  yesNoProcedure(d.mechanicalCpr, 'Mechanical chest compressions');
  yesNoProcedure(d.ecpr, 'Extracorporeal CPR (ECPR)');
  yesNoProcedure(d.temperatureControl, 'Temperature control after ROSC');

  const medications: string[] = [];
  for (const e of timeline.doses) {
    const rx = e.inCatalogue ? RXNORM_BY_DRUG[e.key] : undefined;
    const ucum = UCUM_DOSE[e.unit];
    add({
      resourceType: 'MedicationAdministration',
      id: e.id,
      status: 'completed',
      medicationCodeableConcept: {
        ...(rx ? { coding: [{ system: FHIR_SYSTEMS.rxnorm, code: rx.code, display: rx.display }] } : {}),
        text: e.label,
      },
      subject,
      context: encounter,
      effectiveDateTime: at(e),
      dosage: {
        route: { text: ROUTE_TEXT[e.route] ?? e.route },
        dose: { value: e.dose, unit: ucum.unit, system: FHIR_SYSTEMS.ucum, code: ucum.code },
      },
    });
    medications.push(e.id);
  }

  const observations: string[] = [];
  const category = (code: string, display: string) => [{ coding: [{ system: FHIR_SYSTEMS.observationCategory, code, display }] }];
  for (const e of timeline.rhythmChecks) {
    add({
      resourceType: 'Observation',
      id: e.id,
      status: 'final',
      category: category('exam', 'Exam'),
      code: { text: 'Cardiac rhythm at rhythm check' },
      subject,
      encounter,
      effectiveDateTime: at(e),
      // An organised rhythm without a pulse is reported as PEA.
      valueCodeableConcept: { text: RHYTHM_TEXT[e.rhythmClass === 'pea' ? 'pea' : e.rhythm] ?? e.rhythm },
      component: [{ code: { text: 'Pulse present' }, valueBoolean: e.pulse }],
    });
    observations.push(e.id);
  }
  for (const e of timeline.etco2) {
    add({
      resourceType: 'Observation',
      id: e.id,
      status: 'final',
      category: category('vital-signs', 'Vital Signs'),
      code: { coding: [{ system: FHIR_SYSTEMS.loinc, ...LOINC_ETCO2 }], text: 'ETCO2' },
      subject,
      encounter,
      effectiveDateTime: at(e),
      valueQuantity: { value: e.mmHg, unit: 'mmHg', system: FHIR_SYSTEMS.ucum, code: 'mm[Hg]' },
    });
    observations.push(e.id);
  }

  for (const [i, r] of timeline.rosc.entries()) {
    const id = newId();
    add({
      resourceType: 'Observation',
      id,
      status: 'final',
      category: category('exam', 'Exam'),
      code: { text: 'Return of spontaneous circulation (ROSC)' },
      subject,
      encounter,
      effectivePeriod: { start: new Date(r.startMs).toISOString(), ...(r.endMs !== null ? { end: new Date(r.endMs).toISOString() } : {}) },
      valueBoolean: true,
      note: [{ text: `ROSC period ${i + 1}; ${r.endedBy === 'rearrest' ? 'ended in re-arrest' : r.endedBy === 'compressions' ? 'ended when compressions restarted' : 'lasted to the end of the code'}.` }],
    });
    observations.push(id);
  }

  // The event's outcome and the follow-up: a separate section, each absent while not known.
  const outcomes: string[] = [];
  const outcomeObservation = (text: string, value: Json, extra: Json = {}) => {
    const id = newId();
    add({ resourceType: 'Observation', id, status: 'final', category: category('survey', 'Survey'), code: { text }, subject, encounter, ...value, ...extra });
    outcomes.push(id);
  };
  outcomeObservation('Any ROSC during the event', { valueBoolean: summary.anyRosc }, { effectiveDateTime: summary.times.endedAt ?? summary.horizonAt });
  if (summary.sustainedRosc !== null) {
    outcomeObservation('Sustained ROSC (20 minutes or more without compressions)', { valueBoolean: summary.sustainedRosc }, { effectiveDateTime: summary.times.endedAt ?? summary.horizonAt });
  }
  if (summary.outcome) {
    outcomeObservation('Outcome at the end of the event', { valueCodeableConcept: { text: OUTCOME_WORDS[summary.outcome] } }, summary.times.endedAt ? { effectiveDateTime: summary.times.endedAt } : {});
  }
  const followUpObservation = (text: string, answer: { value: string; date: string | null; enteredBy: { displayName: string }; enteredAt: string } | null, words: Record<string, string>) => {
    if (!answer || answer.value === 'unknown') return;
    outcomeObservation(text, { valueCodeableConcept: { text: words[answer.value] ?? answer.value } }, {
      ...(answer.date ? { effectiveDateTime: answer.date } : {}),
      issued: answer.enteredAt,
      performer: [{ display: answer.enteredBy.displayName }],
    });
  };
  followUpObservation('Survival to hospital discharge', f?.survivalToDischarge ?? null, SURVIVAL_WORDS);
  followUpObservation('Status 30 days after the arrest', f?.status30Days ?? null, STATUS_30_DAYS_WORDS);
  followUpObservation('Neurological outcome at hospital discharge', f?.neurologicalOutcome ?? null, NEUROLOGICAL_OUTCOME_WORDS);

  // The registry details completed at review: known answers only.
  const details: string[] = [];
  const known = (field: UtsteinField) => d[field] !== undefined && d[field] !== 'unknown' && !(Array.isArray(d[field]) && (d[field] as string[]).includes('unknown'));
  const detail = (field: UtsteinField, value: Json, extra: Json = {}) => {
    const id = newId();
    add({ resourceType: 'Observation', id, status: 'final', code: { text: UTSTEIN_FIELD_LABELS[field] }, subject, encounter, effectiveDateTime: summary.times.arrestAt, ...value, ...extra });
    details.push(id);
  };
  const words = (field: UtsteinField) => ({ valueCodeableConcept: { text: utsteinValueText(field, d) ?? '' } });
  if (d.witnessed === 'yes' || d.witnessed === 'no') {
    detail('witnessed', { valueBoolean: d.witnessed === 'yes' }, d.witnessedBy && d.witnessedBy !== 'unknown' ? { component: [{ code: { text: UTSTEIN_FIELD_LABELS.witnessedBy }, valueCodeableConcept: { text: utsteinValueText('witnessedBy', d) } }] } : {});
  }
  if (d.monitored === 'yes' || d.monitored === 'no') {
    detail('monitored', { valueBoolean: d.monitored === 'yes' }, d.monitoring ? { component: d.monitoring.map((m) => ({ code: { text: UTSTEIN_FIELD_LABELS.monitoring }, valueCodeableConcept: { text: utsteinValueText('monitoring', { monitoring: [m] }) } })) } : {});
  }
  for (const field of ['arrestLocation', 'cause', 'specialCircumstances', 'treatmentLimitation', 'stopReason', 'twelveLeadEcg', 'destination'] as const) {
    if (known(field)) detail(field, words(field), field === 'cause' && d.causeNote ? { note: [{ text: d.causeNote }] } : {});
  }
  if (d.teamArrivedAt) detail('teamArrivedAt', { valueDateTime: new Date(d.teamArrivedAt).toISOString() });
  if (d.padsOnAt) detail('padsOnAt', { valueDateTime: new Date(d.padsOnAt).toISOString() });
  if (d.deathPronouncedAt || d.deathPronouncedBy) {
    detail('deathPronouncedAt', d.deathPronouncedAt ? { valueDateTime: new Date(d.deathPronouncedAt).toISOString() } : {}, d.deathPronouncedBy ? { performer: [{ display: d.deathPronouncedBy }] } : {});
  }
  const quantity = (value: number, unit: string, code: string) => ({ value, unit, system: FHIR_SYSTEMS.ucum, code });
  const handover = { effectiveDateTime: summary.times.endedAt ?? summary.horizonAt };
  if (d.handoverSystolicMmHg !== undefined || d.handoverDiastolicMmHg !== undefined) {
    const id = newId();
    add({
      resourceType: 'Observation',
      id,
      status: 'final',
      category: category('vital-signs', 'Vital Signs'),
      code: { coding: [{ system: FHIR_SYSTEMS.loinc, ...LOINC_VITALS.bloodPressurePanel }], text: 'Blood pressure at hand-over' },
      subject,
      encounter,
      ...handover,
      component: [
        ...(d.handoverSystolicMmHg !== undefined ? [{ code: { coding: [{ system: FHIR_SYSTEMS.loinc, ...LOINC_VITALS.systolic }] }, valueQuantity: quantity(d.handoverSystolicMmHg, 'mmHg', 'mm[Hg]') }] : []),
        ...(d.handoverDiastolicMmHg !== undefined ? [{ code: { coding: [{ system: FHIR_SYSTEMS.loinc, ...LOINC_VITALS.diastolic }] }, valueQuantity: quantity(d.handoverDiastolicMmHg, 'mmHg', 'mm[Hg]') }] : []),
      ],
    });
    details.push(id);
  }
  if (d.handoverSpo2Percent !== undefined) {
    const id = newId();
    add({ resourceType: 'Observation', id, status: 'final', category: category('vital-signs', 'Vital Signs'), code: { coding: [{ system: FHIR_SYSTEMS.loinc, ...LOINC_VITALS.spo2 }], text: 'SpO2 at hand-over' }, subject, encounter, ...handover, valueQuantity: quantity(d.handoverSpo2Percent, '%', '%') });
    details.push(id);
  }
  if (d.handoverGlucose) {
    const g = d.handoverGlucose;
    const id = newId();
    add({
      resourceType: 'Observation',
      id,
      status: 'final',
      category: category('laboratory', 'Laboratory'),
      code: { coding: [{ system: FHIR_SYSTEMS.loinc, ...(g.unit === 'mmol/L' ? LOINC_VITALS.glucoseMoles : LOINC_VITALS.glucoseMass) }], text: 'Glucose at hand-over' },
      subject,
      encounter,
      ...handover,
      valueQuantity: quantity(g.value, g.unit, g.unit),
    });
    details.push(id);
  }

  const meanings = new Set(input.signatures.map((s) => s.meaning));
  const final = meanings.has('recorded-by') && meanings.has('reviewed-confirmed');
  const provenances = input.signatures.map((s) => ({
    resourceType: 'Provenance',
    id: newId(),
    target: [{ reference: urn(compositionId) }],
    recorded: s.signedAt,
    agent: [{ type: { text: s.meaning === 'recorded-by' ? 'Recorded by' : 'Reviewed and confirmed by' }, who: { display: s.printedName } }],
    signature: [
      {
        type: [{ system: FHIR_SYSTEMS.signatureType, ...SIGNATURE_TYPE[s.meaning] }],
        when: s.signedAt,
        who: { display: s.printedName },
        ...(s.serverSignature ? { data: base64(s.serverSignature) } : {}),
      },
    ],
  }));

  const refs = (ids: string[]) => ids.map((id) => ({ reference: urn(id) }));
  const section = (title: string, ids: string[], empty: string) =>
    ids.length > 0 ? { title, entry: refs(ids) } : { title, emptyReason: { text: empty } };
  const composition = {
    resourceType: 'Composition',
    id: compositionId,
    status: final ? 'final' : 'preliminary',
    // No LOINC document code in the clinical sheet for a resuscitation record, so the type is text.
    type: { text: 'Cardiac arrest resuscitation record' },
    subject,
    encounter,
    date: input.generatedAt,
    author: [{ display: input.facility }],
    title: `Resuscitation record, ${where || 'location not recorded'}, ${summary.times.arrestAt.slice(0, 10)}`,
    attester: input.signatures.map((s) => ({ mode: s.meaning === 'recorded-by' ? 'professional' : 'legal', time: s.signedAt, party: { display: s.printedName } })),
    custodian: { display: input.facility },
    section: [
      { title: 'Event', entry: refs([encounterId, condition.id]) },
      section('Resuscitation procedures', procedures, 'No compressions, shocks, airway or access recorded'),
      section('Medications given', medications, 'No drugs recorded'),
      section('Observations', observations, 'No rhythm checks, ETCO2 or ROSC recorded'),
      section('Outcome and follow-up', outcomes, 'No outcome recorded'),
      section('Registry details (Utstein)', details, 'No registry details entered'),
    ],
  };

  const all = [composition, ...resources, ...provenances];
  return {
    resourceType: 'Bundle',
    id: newId(),
    identifier: { system: 'urn:ietf:rfc:3986', value: urn(newId()) },
    type: 'document',
    timestamp: input.generatedAt,
    entry: all.map((r) => ({ fullUrl: urn(r.id), resource: r })),
  };
}
