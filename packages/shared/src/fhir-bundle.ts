import type { Code } from './codes.js';
import type { DoseUnit } from './entries.js';
import type { SignatureMeaning } from './records.js';
import type { CodeSummary } from './summary.js';
import type { Timeline } from './timeline.js';

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
  add({
    resourceType: 'Patient',
    id: patientId,
    ...(p?.mrn ? { identifier: [{ type: { text: 'Medical record number' }, value: p.mrn }] } : {}),
    ...(p?.name ? { name: [{ text: p.name }] } : {}),
    gender: p?.sex ?? 'unknown',
    ...(p?.birthDate ? { birthDate: p.birthDate } : {}),
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
      section('Resuscitation procedures', procedures, 'No compressions or shocks recorded'),
      section('Medications given', medications, 'No drugs recorded'),
      section('Observations', observations, 'No rhythm checks or ETCO2 recorded'),
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
