import { describe, expect, it } from 'vitest';
import { reviewDetailsSchema } from './records.js';
import {
  applyUtsteinPatch,
  effectiveUtstein,
  followUpMissing,
  followUpProblems,
  followUpSchema,
  utsteinChanges,
  utsteinProblems,
  utsteinValueText,
  type UtsteinAddendum,
} from './utstein.js';

const CODE = { arrestAt: '2026-03-04T07:42:10.000Z' };

describe('registry details', () => {
  it('takes the contract form, refuses words outside the value sets and names the field', () => {
    expect(
      reviewDetailsSchema.safeParse({ utstein: { witnessed: 'yes', monitored: 'unknown' } })
        .success,
    ).toBe(true);
    const bad = reviewDetailsSchema.safeParse({ utstein: { witnessed: 'maybe' } });
    expect(bad.success).toBe(false);
    expect(bad.error?.issues[0]?.path).toEqual(['utstein', 'witnessed']);
    expect(reviewDetailsSchema.safeParse({ utstein: { witnesed: 'yes' } }).success).toBe(false);
    expect(reviewDetailsSchema.safeParse({ utstein: {} }).success).toBe(false);
    expect(
      reviewDetailsSchema.safeParse({ utstein: { specialCircumstances: ['none', 'trauma'] } })
        .success,
    ).toBe(false);
    expect(
      reviewDetailsSchema.safeParse({
        utstein: { handoverGlucose: { value: 140, unit: 'mmol/L' } },
      }).success,
    ).toBe(false);
    expect(
      reviewDetailsSchema.safeParse({ utstein: { handoverGlucose: { value: 140, unit: 'mg/dL' } } })
        .success,
    ).toBe(true);
  });

  it('applies a change: a field sent replaces, null clears, a field left out stays; the audit lists old and new', () => {
    const before = {
      witnessed: 'yes' as const,
      witnessedBy: 'staff' as const,
      monitored: 'no' as const,
    };
    const after = applyUtsteinPatch(before, {
      witnessedBy: null,
      witnessed: 'no',
      cause: 'hypoxia',
    });
    expect(after).toEqual({ witnessed: 'no', monitored: 'no', cause: 'hypoxia' });
    expect(utsteinChanges(before, after)).toEqual({
      witnessed: { from: 'yes', to: 'no' },
      witnessedBy: { from: 'staff', to: null },
      cause: { from: null, to: 'hypoxia' },
    });
  });

  it('reads the signed details with each later addendum applied in order', () => {
    const addendum = (changes: UtsteinAddendum['changes']): UtsteinAddendum => ({
      id: 'a',
      recordedAt: '',
      userId: 'u',
      userName: 'U',
      changes,
    });
    expect(
      effectiveUtstein({ witnessed: 'unknown', cause: 'toxins' }, [
        addendum({ witnessed: { from: 'unknown', to: 'yes' } }),
        addendum({ cause: { from: 'toxins', to: null } }),
      ]),
    ).toEqual({ witnessed: 'yes' });
  });

  it('names what does not fit together', () => {
    const paths = (d: Parameters<typeof utsteinProblems>[0]) =>
      utsteinProblems(d, CODE).map((p) => p.path);
    expect(paths({ witnessed: 'no', witnessedBy: 'staff' })).toEqual(['utstein.witnessedBy']);
    expect(paths({ monitoring: ['ecg'] })).toEqual(['utstein.monitoring']);
    expect(paths({ cause: 'toxins', causeNote: 'x' })).toEqual(['utstein.causeNote']);
    expect(paths({ stopReason: 'rosc', deathPronouncedAt: '2026-03-04T08:05:00.000Z' })).toEqual([
      'utstein.deathPronouncedAt',
    ]);
    expect(paths({ handoverSystolicMmHg: 80, handoverDiastolicMmHg: 80 })).toEqual([
      'utstein.handoverDiastolicMmHg',
    ]);
    // Pads can be on before the arrest (a monitored patient); death cannot be pronounced before it.
    expect(
      paths({ padsOnAt: '2026-03-04T07:30:00.000Z', teamArrivedAt: '2026-03-04T07:43:00.000Z' }),
    ).toEqual([]);
    expect(paths({ deathPronouncedAt: '2026-03-04T07:40:00.000Z' })).toEqual([
      'utstein.deathPronouncedAt',
    ]);
    expect(paths({ teamArrivedAt: '2026-03-06T07:43:00.000Z' })).toEqual(['utstein.teamArrivedAt']);
    expect(utsteinValueText('monitoring', { monitoring: ['ecg', 'arterial-line'] })).toBe(
      'ECG, Arterial line',
    );
    expect(utsteinValueText('witnessed', {})).toBeNull();
  });
});

describe('follow-up', () => {
  it('takes the contract form and its value sets', () => {
    expect(
      followUpSchema.safeParse({ survivalToDischarge: 'yes', neurologicalOutcome: 'cpc-1' })
        .success,
    ).toBe(true);
    expect(followUpSchema.safeParse({ neurologicalOutcome: 'mrs-6' }).success).toBe(true);
    expect(followUpSchema.safeParse({ neurologicalOutcome: 'cpc-6' }).success).toBe(false);
    expect(followUpSchema.safeParse({ neurologicalOutcome: 'mrs-7' }).success).toBe(false);
    expect(followUpSchema.safeParse({ survivalToDischargeDate: '20-03-2026' }).success).toBe(false);
  });

  it('is complete with survival and the 30-day status known, and for a survivor the neurological outcome', () => {
    expect(followUpMissing({})).toEqual(['survival to discharge', 'status at 30 days']);
    expect(followUpMissing({ survivalToDischarge: 'yes', status30Days: 'alive' })).toEqual([
      'neurological outcome at discharge',
    ]);
    expect(
      followUpMissing({
        survivalToDischarge: 'yes',
        status30Days: 'alive',
        neurologicalOutcome: 'unknown',
      }),
    ).toEqual(['neurological outcome at discharge']);
    expect(followUpMissing({ survivalToDischarge: 'no', status30Days: 'dead' })).toEqual([]);
  });

  it('refuses answers that contradict each other, the arrest or today', () => {
    const paths = (v: Parameters<typeof followUpProblems>[0], today = '2026-06-01') =>
      followUpProblems(v, CODE, today).map((p) => p.path);
    // CPC 5 and mRS 6 are death (the scales' definitions).
    expect(paths({ survivalToDischarge: 'no', neurologicalOutcome: 'cpc-1' })).toEqual([
      'neurologicalOutcome',
    ]);
    expect(paths({ survivalToDischarge: 'yes', neurologicalOutcome: 'mrs-6' })).toEqual([
      'neurologicalOutcome',
    ]);
    expect(paths({ survivalToDischarge: 'no', neurologicalOutcome: 'cpc-5' })).toEqual([]);
    expect(paths({ survivalToDischarge: 'yes', survivalToDischargeDate: '2026-03-01' })).toEqual([
      'survivalToDischargeDate',
    ]);
    expect(paths({ survivalToDischarge: 'yes', survivalToDischargeDate: '2026-07-01' })).toEqual([
      'survivalToDischargeDate',
    ]);
    expect(paths({ survivalToDischargeDate: '2026-03-10' })).toEqual(['survivalToDischargeDate']);
    // Alive at 30 days is known from day 30 (2026-04-03), and not after an in-hospital death within it.
    expect(paths({ status30Days: 'alive' }, '2026-04-02')).toEqual(['status30Days']);
    expect(paths({ status30Days: 'alive' }, '2026-04-03')).toEqual([]);
    expect(
      paths({
        survivalToDischarge: 'no',
        survivalToDischargeDate: '2026-03-10',
        status30Days: 'alive',
      }),
    ).toEqual(['status30Days']);
  });
});
