import {
  ACCESS_ROUTES,
  AIRWAY_DEVICES,
  DOSE_UNITS,
  doseUnitLabel,
  DRUG_ROUTES,
  END_OUTCOME_CHOICES,
  RHYTHMS,
  type ClinicalEntry,
  type EffectiveEntry,
} from '@steadyhand/shared';
import { formatClockTime } from '../../../lib/format';
import {
  AIRWAY_WORDS,
  OUTCOME_WORDS,
  RHYTHM_WORDS,
  ROUTE_WORDS,
} from '../../../lib/live/entry-words';

// What the correction dialog offers per entry kind, and how its text fields become an
// amendment's `changes`. Pure, so the rules are tested without a browser.

/** One editable field of an entry; every kind lists only the fields a person may correct. */
export type FieldSpec =
  | { name: string; label: string; type: 'number'; step?: string }
  | { name: string; label: string; type: 'text' }
  | {
      name: string;
      label: string;
      type: 'select';
      options: readonly { value: string; label: string }[];
    }
  | { name: string; label: string; type: 'checkbox' };

const options = <T extends string>(values: readonly T[], words?: Partial<Record<T, string>>) =>
  values.map((value) => ({ value, label: words?.[value] ?? value }));

export const FIELDS: Partial<Record<ClinicalEntry['kind'], FieldSpec[]>> = {
  drug: [
    { name: 'dose', label: 'Dose', type: 'number', step: 'any' },
    {
      name: 'unit',
      label: 'Unit',
      type: 'select',
      options: DOSE_UNITS.map((u) => ({ value: u, label: doseUnitLabel(u) })),
    },
    { name: 'route', label: 'Route', type: 'select', options: options(DRUG_ROUTES, ROUTE_WORDS) },
  ],
  shock: [
    { name: 'joules', label: 'Energy (J)', type: 'number', step: '1' },
    { name: 'synchronized', label: 'Synchronised', type: 'checkbox' },
  ],
  rhythm: [
    { name: 'rhythm', label: 'Rhythm', type: 'select', options: options(RHYTHMS, RHYTHM_WORDS) },
    { name: 'pulse', label: 'Pulse present', type: 'checkbox' },
  ],
  etco2: [{ name: 'mmHg', label: 'ETCO2 (mmHg)', type: 'number', step: '1' }],
  lab: [
    { name: 'value', label: 'Value', type: 'number', step: 'any' },
    { name: 'unit', label: 'Unit', type: 'text' },
  ],
  note: [{ name: 'text', label: 'Note', type: 'text' }],
  access: [
    {
      name: 'route',
      label: 'Route',
      type: 'select',
      options: options(ACCESS_ROUTES, { iv: 'IV', io: 'IO' }),
    },
    { name: 'site', label: 'Site', type: 'text' },
  ],
  airway: [
    {
      name: 'device',
      label: 'Device',
      type: 'select',
      options: options(AIRWAY_DEVICES, AIRWAY_WORDS),
    },
  ],
  end: [
    {
      name: 'outcome',
      label: 'Outcome',
      type: 'select',
      options: options(END_OUTCOME_CHOICES, OUTCOME_WORDS),
    },
  ],
};

export type FormValues = Record<string, string | boolean>;

/** "07:42:10" on the entry's own day, back to an ISO time (the reader's time zone, as shown). */
export function withClockTime(iso: string, clock: string): string | null {
  const match = /^(\d{1,2}):(\d{2})(?::(\d{2}))?$/.exec(clock.trim());
  if (!match) return null;
  const [h, m, s] = [Number(match[1]), Number(match[2]), Number(match[3] ?? 0)];
  if (h > 23 || m > 59 || s > 59) return null;
  const d = new Date(iso);
  d.setHours(h, m, s, 0);
  return d.toISOString();
}

export function initialValues(entry: EffectiveEntry): FormValues {
  const values: FormValues = { time: formatClockTime(entry.at), reason: '' };
  for (const field of FIELDS[entry.kind] ?? []) {
    const current = (entry as Record<string, unknown>)[field.name];
    if (field.type === 'checkbox') values[field.name] = current === true;
    else
      values[field.name] =
        typeof current === 'string' || typeof current === 'number' ? String(current) : '';
  }
  return values;
}

/** Only the fields that differ from the entry as it now reads, typed as the entry's schema wants. */
export function changesFrom(
  entry: EffectiveEntry,
  values: FormValues,
): Record<string, unknown> | string {
  const changes: Record<string, unknown> = {};
  // Compared as shown (to the second): a device time with milliseconds is not a change.
  const time = String(values.time).trim();
  if (time !== formatClockTime(entry.at)) {
    const at = withClockTime(entry.at, time);
    if (!at) return 'Time: write it as hh:mm:ss, for example 07:43:40.';
    changes.at = at;
  }
  for (const field of FIELDS[entry.kind] ?? []) {
    const raw = values[field.name];
    const current = (entry as Record<string, unknown>)[field.name];
    let next: unknown = raw;
    if (field.type === 'number') {
      if (String(raw).trim() === '') return `${field.label}: enter a number.`;
      next = Number(raw);
      if (!Number.isFinite(next)) return `${field.label}: enter a number.`;
    } else if (field.type === 'text') {
      next = String(raw).trim();
      if (next === '' && current === undefined) continue;
    }
    if (next !== current) changes[field.name] = next;
  }
  return changes;
}
