import { buildFhirBundle, DEFAULT_PROTOCOL, foldLog, summarize, type LogEntry } from '@steadyhand/shared';
import { Fhir } from 'fhir';
import { describe, expect, it } from 'vitest';

// The shared builder against the FHIR R4 structure definitions of the `fhir` package (npm), here
// because the shared package stays free of dependencies. Codes: clinical sheet §5.

let n = 0;
const uuid = () => `20000000-0000-4000-8000-${String(++n).padStart(12, '0')}`;
const ARREST = '2026-03-04T07:42:10.000Z';
const at = (s: number) => new Date(Date.parse(ARREST) + s * 1000).toISOString();
type NoBase<T> = T extends unknown ? Omit<T, 'id' | 'at'> : never;
const e = (s: number, fields: NoBase<LogEntry>): LogEntry => ({ id: uuid(), at: at(s), ...fields });

describe('FHIR document bundle from the shared builder', () => {
  it('validates with every kind of entry, a voided dose left out, and stays preliminary with one signature', () => {
    const voided = e(300, { kind: 'drug', drug: 'epinephrine', dose: 10, unit: 'mg', route: 'iv' });
    const entries: LogEntry[] = [
      e(10, { kind: 'cpr', action: 'start' }),
      e(60, { kind: 'rhythm', rhythm: 'pvt', pulse: false }),
      e(70, { kind: 'shock', joules: 150, synchronized: false }),
      e(200, { kind: 'shock', joules: 100, synchronized: true }),
      voided,
      e(305, { kind: 'void', target: voided.id, reason: 'Wrong dose tapped' }),
      e(310, { kind: 'drug', drug: 'adenosine', dose: 6, unit: 'mg', route: 'iv' }),
      e(320, { kind: 'drug', drug: 'Glucagon', dose: 1000, unit: 'ug', route: 'other' }),
      e(330, { kind: 'drug', drug: 'magnesium-sulfate', dose: 2, unit: 'g', route: 'io' }),
      e(340, { kind: 'etco2', mmHg: 32 }),
      e(350, { kind: 'airway', device: 'supraglottic' }),
      e(360, { kind: 'access', route: 'iv', site: 'left antecubital' }),
      e(400, { kind: 'rosc' }),
      e(600, { kind: 'end', outcome: 'other' }),
    ];
    const code = { id: uuid(), category: 'adult' as const, location: null, arrestAt: ARREST, endedAt: at(600), patient: { name: 'Unknown, Bay 2', sex: 'female' as const, birthDate: '1950-02-03', mrn: 'HV-0042' } };
    const timeline = foldLog({ ...code, weightKg: null }, entries, DEFAULT_PROTOCOL);
    const bundle = buildFhirBundle({
      code, timeline, facility: 'Harbourview General Hospital', unitName: null,
      summary: summarize(timeline),
      // Every kind of registry detail and follow-up answer, so each resource they make is validated.
      utstein: {
        witnessed: 'yes', witnessedBy: 'other', monitored: 'yes', monitoring: ['ecg', 'arterial-line'], arrestLocation: 'procedure-area',
        teamArrivedAt: at(60), padsOnAt: at(-300), cause: 'other', causeNote: 'Air embolism', specialCircumstances: ['pregnancy', 'trauma'],
        treatmentLimitation: 'none', mechanicalCpr: 'yes', ecpr: 'no', stopReason: 'other', deathPronouncedAt: at(650), deathPronouncedBy: 'Dr Kofi Asante',
        temperatureControl: 'no', twelveLeadEcg: 'not-done', handoverSystolicMmHg: 90, handoverDiastolicMmHg: 50, handoverSpo2Percent: 92,
        handoverGlucose: { value: 160, unit: 'mg/dL' }, destination: 'other-hospital',
      },
      followUp: {
        survivalToDischarge: { value: 'no', date: '2026-03-04', enteredBy: { id: 'u', displayName: 'Ewan Trelawny, RN' }, enteredAt: at(2000) },
        status30Days: { value: 'dead', date: '2026-03-04', enteredBy: { id: 'u', displayName: 'Ewan Trelawny, RN' }, enteredAt: at(2000) },
        neurologicalOutcome: { value: 'cpc-5', date: null, enteredBy: { id: 'u', displayName: 'Ewan Trelawny, RN' }, enteredAt: at(2000) },
        complete: true,
        missing: [],
      },
      signatures: [{ printedName: 'Dr Kofi Asante', meaning: 'reviewed-confirmed', signedAt: at(900) }],
      generatedAt: at(1000), newId: uuid,
    });
    const result = new Fhir().validate(bundle, { errorOnUnexpected: true });
    expect(result.messages.filter((m) => ['error', 'fatal'].includes(String(m.severity)))).toEqual([]);
    expect(result.valid).toBe(true);
    const resources = bundle.entry.map((x) => x.resource);
    expect(resources[0]).toMatchObject({ resourceType: 'Composition', status: 'preliminary' });
    const meds = resources.filter((r) => r.resourceType === 'MedicationAdministration');
    expect(meds).toHaveLength(3); // the voided dose is not exported
    expect(JSON.stringify(meds)).toContain('"code":"296"'); // adenosine, RxNorm from memory per the sheet
    expect(JSON.stringify(meds)).toContain('"code":"ug"');
    const shocks = resources.filter((r) => r.resourceType === 'Procedure' && r.id !== undefined && JSON.stringify(r).includes(' J, '));
    expect(shocks).toHaveLength(2);
    expect(resources.find((r) => r.resourceType === 'Patient')).toMatchObject({ deceasedDateTime: at(650) });
    expect(resources.filter((r) => r.resourceType === 'Observation').length).toBeGreaterThanOrEqual(20);
  });

  it('the validator itself refuses a broken bundle (so a pass above means something)', () => {
    const result = new Fhir().validate({ resourceType: 'Bundle', type: 'document', entry: [{ resource: { resourceType: 'Observation', status: 'final', code: { text: 'x' }, valueQuantity: { value: 'high' } } }] }, { errorOnUnexpected: true });
    expect(result.valid).toBe(false);
  });
});
