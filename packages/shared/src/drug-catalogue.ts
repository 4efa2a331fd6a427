import type { DoseUnit } from './entries.js';
import type { DrugDefinition, ProtocolSettings } from './protocol.js';

/**
 * How a drug entry is matched to the protocol's catalogue, and the one unit policy every
 * total follows: mass units (g, mg, mcg) convert to the catalogue's unit; mEq and mL never
 * convert, so a dose in the wrong kind of unit stays visible instead of hiding in a sum.
 */

/** The catalogue key the epinephrine clock follows. */
export const EPINEPHRINE_KEY = 'epinephrine';

/** Other names a recorder may type for a catalogue drug (free-text entries). */
const DRUG_SYNONYMS: Readonly<Record<string, string>> = {
  adrenaline: 'epinephrine',
  adrenalin: 'epinephrine',
  epi: 'epinephrine',
  lignocaine: 'lidocaine',
  // Labels of earlier protocol versions, still found in older free-text entries.
  'sodium bicarbonate 8.4%': 'sodium-bicarbonate',
  'sodium bicarbonate 4.2%': 'sodium-bicarbonate',
};

/** Milligrams per unit, for the mass units only. */
const MG_PER_UNIT: Partial<Record<DoseUnit, number>> = { g: 1000, mg: 1, ug: 0.001 };

const UNIT_LABEL: Record<DoseUnit, string> = {
  mg: 'mg',
  // Shown as "mcg": "ug" and "µg" are easily misread as "mg".
  ug: 'mcg',
  g: 'g',
  meq: 'mEq',
  mL: 'mL',
};

export function doseUnitLabel(unit: DoseUnit): string {
  return UNIT_LABEL[unit];
}

/** A dose in another unit, or null when the two units do not convert (mEq, mL against mass). */
export function convertDose(dose: number, from: DoseUnit, to: DoseUnit): number | null {
  if (from === to) return dose;
  const f = MG_PER_UNIT[from];
  const t = MG_PER_UNIT[to];
  return f === undefined || t === undefined ? null : (dose * f) / t;
}

/** Hides binary floating-point noise (0.1 + 0.2) in sums of doses. */
export function roundTotal(x: number): number {
  return Math.round(x * 1e6) / 1e6;
}

function normalizeName(name: string): string {
  return name.trim().toLowerCase();
}

/** Looks drugs up by key, label or synonym; built once per fold (a dozen drugs). */
export class DrugCatalogue {
  private readonly index = new Map<string, DrugDefinition>();

  constructor(settings: ProtocolSettings) {
    for (const d of settings.drugs) {
      this.index.set(normalizeName(d.label), d);
      this.index.set(normalizeName(d.key), d); // the key wins over another drug's label
    }
  }

  /** The catalogue drug an entry names, or undefined for free text. Case and spaces do not matter. */
  find(name: string): DrugDefinition | undefined {
    const n = normalizeName(name);
    return this.index.get(n) ?? this.index.get(DRUG_SYNONYMS[n] ?? '');
  }

  /** The key totals are kept under: the catalogue key, or the free text in lower case. */
  identity(name: string): { key: string; label: string; def: DrugDefinition | undefined } {
    const def = this.find(name);
    return def ? { key: def.key, label: def.label, def } : { key: normalizeName(name), label: name.trim(), def: undefined };
  }
}

/** The catalogue drug a drug entry names (by key, label or a known synonym), or undefined for free text. */
export function resolveDrug(settings: ProtocolSettings, name: string): DrugDefinition | undefined {
  return new DrugCatalogue(settings).find(name);
}
