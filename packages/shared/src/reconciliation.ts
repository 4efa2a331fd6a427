import { z } from 'zod';
import { DOSE_UNITS, type DoseUnit } from './entries.js';
import { resolveDrug } from './drug-catalogue.js';
import { usualConcentration } from './dosing.js';
import type { CodeCategory } from './codes.js';
import type { ProtocolSettings } from './protocol.js';
import type { DrugTotal } from './summary.js';

/**
 * Drug reconciliation after a code: what the record says was given (the summary's drug
 * totals) against what the pharmacist counts as opened and wasted from the cart's tray.
 * Pure: the server, the web page and the tests run the same rules.
 */

// ---------------------------------------------------------------- tray templates

export const TRAY_LOT_MAX = 40;

export const trayItemInputSchema = z
  .object({
    /** Kept when an existing item is edited, so reconciliation lines keep pointing at it. */
    id: z.string().min(1).max(64).optional(),
    drugKey: z.string().trim().toLowerCase().min(1).max(40),
    label: z.string().trim().min(1).max(80),
    /** Amount of drug in one vial, syringe or ampoule. */
    strengthAmount: z.number().positive().max(100_000),
    strengthUnit: z.enum(DOSE_UNITS),
    /** Volume of one unit in mL (1 mg in 10 mL): converts doses recorded in mL. */
    volumeMl: z.number().positive().max(1000).nullable().default(null),
    /** How many the tray holds (par level). */
    quantity: z.number().int().min(0).max(500),
    /** Controlled drugs: waste needs a witness, and they are reconciled first. */
    controlled: z.boolean().default(false),
    /** Lot (batch) number of the units now on the tray; blank is no lot recorded. */
    lot: z
      .string({ message: 'must be text, e.g. EP2291' })
      .trim()
      .max(TRAY_LOT_MAX, `must be at most ${TRAY_LOT_MAX} characters`)
      .transform((v) => (v === '' ? null : v))
      .nullable()
      .default(null),
    /** Expiry date of the units now on the tray (the earliest, when lots are mixed). */
    expiry: z.iso.date({ message: 'must be a date, YYYY-MM-DD, e.g. 2027-03-31' }).nullable().default(null),
  })
  .strict();
export type TrayItemInput = z.input<typeof trayItemInputSchema>;

export const trayTemplateInputSchema = z
  .object({
    name: z.string().trim().min(1).max(80),
    active: z.boolean().default(true),
    items: z.array(trayItemInputSchema).min(1).max(60),
  })
  .strict()
  .superRefine((tray, ctx) => {
    const seen = new Set<string>();
    tray.items.forEach((item, index) => {
      // One item per drug keeps "given" and "opened" comparable row by row.
      if (seen.has(item.drugKey)) {
        ctx.addIssue({ code: 'custom', path: ['items', index, 'drugKey'], message: `"${item.drugKey}" is on this tray twice: one item per drug` });
      }
      seen.add(item.drugKey);
    });
  });
export type TrayTemplateInput = z.input<typeof trayTemplateInputSchema>;

export interface TrayItem {
  id: string;
  drugKey: string;
  label: string;
  strengthAmount: number;
  strengthUnit: DoseUnit;
  volumeMl: number | null;
  quantity: number;
  controlled: boolean;
  sortOrder: number;
  lot: string | null;
  /** YYYY-MM-DD. */
  expiry: string | null;
}

export interface TrayTemplate {
  id: string;
  name: string;
  active: boolean;
  items: TrayItem[];
  /** Units whose code cart carries this tray. */
  unitIds: string[];
  updatedAt: string;
}

export interface PharmacyUnit {
  id: string;
  name: string;
  trayId: string | null;
  trayName: string | null;
}

/** Within this many days of its expiry a tray item is flagged for replacement. */
export const EXPIRY_WARNING_DAYS = 30;

export const EXPIRY_NOTES = ['expired', 'expires within 30 days'] as const;
export type ExpiryNote = (typeof EXPIRY_NOTES)[number];

/**
 * "expired" once the expiry date has passed (a unit is usable through its expiry date),
 * "expires within 30 days" up to 30 days before it, else null. Dates are YYYY-MM-DD; `today`
 * is the caller's (the server uses the UTC date).
 */
export function expiryNote(expiry: string | null | undefined, today: string): ExpiryNote | null {
  if (!expiry) return null;
  if (expiry < today) return 'expired';
  const limit = new Date(`${today}T00:00:00Z`);
  limit.setUTCDate(limit.getUTCDate() + EXPIRY_WARNING_DAYS);
  return expiry <= limit.toISOString().slice(0, 10) ? 'expires within 30 days' : null;
}

export const unitTrayInputSchema = z.object({ trayId: z.string().min(1).max(64).nullable() }).strict();
export type UnitTrayInput = z.infer<typeof unitTrayInputSchema>;

/** "1 mg in 10 mL", "150 mg in 3 mL", "2 g". */
export function formatStrength(item: Pick<TrayItem, 'strengthAmount' | 'strengthUnit' | 'volumeMl'>): string {
  const amount = `${formatAmount(item.strengthAmount)} ${UNIT_WORDS[item.strengthUnit]}`;
  return item.volumeMl !== null && item.strengthUnit !== 'mL' ? `${amount} in ${formatAmount(item.volumeMl)} mL` : amount;
}

export const UNIT_WORDS: Record<DoseUnit, string> = { mg: 'mg', ug: 'mcg', g: 'g', meq: 'mEq', mL: 'mL' };

export function formatAmount(n: number): string {
  return String(Math.round(n * 1000) / 1000);
}

// ---------------------------------------------------------------- lines and requests

const lineInputSchema = z
  .object({
    drugKey: z.string().trim().toLowerCase().min(1).max(40),
    trayItemId: z.string().min(1).max(64).nullable().default(null),
    unitsOpened: z.number().int().min(0).max(500),
    /** Whole units discarded with nothing given from them (dropped, drawn up and not used). */
    unitsWasted: z.number().int().min(0).max(500),
    wasteWitness: z.string().trim().max(120).nullable().default(null),
    lotNumbers: z.string().trim().max(200).nullable().default(null),
    note: z.string().trim().max(500).nullable().default(null),
  })
  .strict()
  .refine((l) => l.unitsWasted <= l.unitsOpened, { message: 'units wasted cannot be more than units opened', path: ['unitsWasted'] });
export const reconciliationLineInputSchema = lineInputSchema;
export type ReconciliationLineInput = z.output<typeof lineInputSchema>;

export const saveReconciliationSchema = z
  .object({
    trayId: z.string().min(1).max(64).nullable().optional(),
    notes: z.string().trim().max(4000).nullable().default(null),
    lines: z.array(lineInputSchema).max(80),
  })
  .strict()
  .superRefine((body, ctx) => {
    const seen = new Set<string>();
    body.lines.forEach((line, index) => {
      if (seen.has(line.drugKey)) ctx.addIssue({ code: 'custom', path: ['lines', index, 'drugKey'], message: `"${line.drugKey}" has two lines` });
      seen.add(line.drugKey);
    });
  });
export type SaveReconciliationRequest = z.input<typeof saveReconciliationSchema>;

export const signReconciliationSchema = z.object({ password: z.string().min(1, 'password is required').max(1024) }).strict();
export type SignReconciliationRequest = z.infer<typeof signReconciliationSchema>;

export const reconciliationAddendumSchema = z
  .object({
    text: z.string().trim().min(1, 'say what the addendum is about').max(2000),
    /** Corrected counts for some drugs; they replace the signed line for that drug from now on. */
    lines: z.array(lineInputSchema).max(80).default([]),
  })
  .strict();
export type ReconciliationAddendumRequest = z.input<typeof reconciliationAddendumSchema>;

// ---------------------------------------------------------------- the rules

export const DISCREPANCY_KINDS = [
  'given-more-than-opened',
  'opened-not-recorded',
  'unit-mismatch',
  'not-on-tray',
  'waste-not-witnessed',
  'partly-used',
  'balanced',
] as const;
export type DiscrepancyKind = (typeof DISCREPANCY_KINDS)[number];

/** Kinds the pharmacist must resolve or explain; `partly-used` and `balanced` are information. */
export const PROBLEM_KINDS: readonly DiscrepancyKind[] = [
  'given-more-than-opened',
  'opened-not-recorded',
  'unit-mismatch',
  'not-on-tray',
  'waste-not-witnessed',
];

export const DISCREPANCY_WORDS: Record<DiscrepancyKind, string> = {
  'given-more-than-opened': 'Given more than opened',
  'opened-not-recorded': 'Opened, not recorded',
  'unit-mismatch': 'Units do not compare',
  'not-on-tray': 'Not on the tray',
  'waste-not-witnessed': 'Waste needs a witness',
  'partly-used': 'Partly used: waste the rest',
  balanced: 'Balanced',
};

export interface Discrepancy {
  kind: DiscrepancyKind;
  message: string;
}

export interface RecordedTotal {
  total: number;
  unit: DoseUnit;
  doses: number;
}

export interface ReconciledDrug {
  drugKey: string;
  label: string;
  controlled: boolean;
  trayItemId: string | null;
  /** "1 mg in 10 mL"; null for a drug that is not on the tray. */
  strength: string | null;
  /** The unit every amount below is in: the tray item's strength unit (or the recorded one). */
  unit: DoseUnit | null;
  /** Totals as recorded, one per unit used in the record. */
  recorded: RecordedTotal[];
  doses: number;
  /** Total given in `unit`; null when a recorded unit cannot be converted. */
  given: number | null;
  unitsOpened: number;
  unitsWasted: number;
  /** (opened - wasted) × strength. */
  available: number | null;
  /** available - given: what is left in opened units (to waste). */
  leftover: number | null;
  /** Units the tray needs back: every opened unit. */
  restock: number;
  /** How many the tray holds; null for a drug not on the tray. */
  par: number | null;
  wasteWitness: string | null;
  lotNumbers: string | null;
  /** The tray item's lot and expiry (YYYY-MM-DD) on the tray template; null when not known. */
  trayLot: string | null;
  trayExpiry: string | null;
  note: string | null;
  /** Problems first; `balanced` alone when all is well. */
  discrepancies: Discrepancy[];
  /** Whether any discrepancy is a problem (PROBLEM_KINDS). */
  flagged: boolean;
  /** Something was given, opened or wasted. */
  touched: boolean;
}

const MG_PER: Partial<Record<DoseUnit, number>> = { g: 1000, mg: 1, ug: 0.001 };
/** Float noise only: 0.1 + 0.2 must equal 0.3 in a comparison. */
const EPSILON = 1e-6;
const round = (n: number): number => Math.round(n * 1e6) / 1e6;

function massConvert(amount: number, from: DoseUnit, to: DoseUnit): number | null {
  if (from === to) return amount;
  const f = MG_PER[from];
  const t = MG_PER[to];
  return f === undefined || t === undefined ? null : (amount * f) / t;
}

export interface StrengthLike {
  strengthAmount: number;
  strengthUnit: DoseUnit;
  volumeMl: number | null;
}

/**
 * A recorded dose in the tray item's unit, or null when it cannot be converted.
 * - mass units convert (g, mg, ug);
 * - a dose in mL converts through the item's concentration (amount ÷ volume of one unit);
 * - an item counted in mL (a "50 mL syringe") takes a dose in mg or mEq through the catalogue's
 *   concentration per mL (sodium bicarbonate 8.4% is 1 mEq/mL);
 * - mEq never converts to a mass (that would need the salt's molar mass).
 */
export function convertToItemUnit(
  amount: number,
  from: DoseUnit,
  item: StrengthLike,
  catalogue?: { unit: DoseUnit; concentrationPerMl?: number | undefined },
): number | null {
  const to = item.strengthUnit;
  const direct = massConvert(amount, from, to);
  if (direct !== null) return direct;
  if (from === 'mL') {
    if (item.volumeMl !== null && to !== 'mL') return (amount * item.strengthAmount) / item.volumeMl;
    if (catalogue?.concentrationPerMl !== undefined) return massConvert(amount * catalogue.concentrationPerMl, catalogue.unit, to);
    return null;
  }
  if (to === 'mL') {
    if (catalogue?.concentrationPerMl === undefined) return null;
    const inCatalogueUnit = massConvert(amount, from, catalogue.unit);
    return inCatalogueUnit === null ? null : inCatalogueUnit / catalogue.concentrationPerMl;
  }
  return null;
}

export interface ReconcileInput {
  /** summarize(foldLog(...)).drugTotals: per drug and unit, voids and amendments applied. */
  drugTotals: readonly Pick<DrugTotal, 'drug' | 'label' | 'unit' | 'total' | 'doses'>[];
  /** The tray the cart carries; empty when none is known. */
  items: readonly TrayItem[];
  lines: readonly ReconciliationLineInput[];
  /** For names and the catalogue's concentrations (mL-only tray items): the code's protocol version. */
  settings?: ProtocolSettings;
  /** Picks the concentration band (dextrose 10% for a child, 50% for an adult...). */
  category?: CodeCategory;
}

/**
 * One row per drug that is on the tray or was given. Rows: controlled drugs first, then
 * problems, then what was touched, then tray order.
 */
export function reconcileDrugs(input: ReconcileInput): ReconciledDrug[] {
  const byDrug = new Map<string, { label: string; recorded: RecordedTotal[] }>();
  for (const t of input.drugTotals) {
    const key = t.drug.trim().toLowerCase();
    const row = byDrug.get(key) ?? { label: t.label, recorded: [] };
    row.recorded.push({ total: t.total, unit: t.unit, doses: t.doses });
    byDrug.set(key, row);
  }
  const lines = new Map(input.lines.map((l) => [l.drugKey, l]));
  const itemsByDrug = new Map(input.items.map((i) => [i.drugKey, i]));
  const keys = [...input.items.map((i) => i.drugKey), ...[...byDrug.keys()].filter((k) => !itemsByDrug.has(k))];
  const order = new Map(keys.map((k, i) => [k, i]));

  const rows = keys.map((key) => {
    const item = itemsByDrug.get(key) ?? null;
    const given = byDrug.get(key);
    const line = lines.get(key);
    const def = input.settings ? resolveDrug(input.settings, key) : undefined;
    return reconcileOne({
      drugKey: key,
      label: item?.label ?? given?.label ?? def?.label ?? key,
      item,
      recorded: given?.recorded ?? [],
      line,
      catalogue: def ? { unit: def.unit, concentrationPerMl: usualConcentration(def, input.category ?? 'adult')?.perMl } : undefined,
    });
  });

  const rank = (r: ReconciledDrug) => (r.controlled ? 0 : 4) + (r.flagged ? 0 : 2) + (r.touched ? 0 : 1);
  return rows.sort((a, b) => rank(a) - rank(b) || (order.get(a.drugKey) ?? 0) - (order.get(b.drugKey) ?? 0));
}

interface OneInput {
  drugKey: string;
  label: string;
  item: TrayItem | null;
  recorded: RecordedTotal[];
  line: ReconciliationLineInput | undefined;
  catalogue: { unit: DoseUnit; concentrationPerMl?: number | undefined } | undefined;
}

function reconcileOne({ drugKey, label, item, recorded, line, catalogue }: OneInput): ReconciledDrug {
  const unitsOpened = line?.unitsOpened ?? 0;
  const unitsWasted = Math.min(line?.unitsWasted ?? 0, unitsOpened);
  const doses = recorded.reduce((n, r) => n + r.doses, 0);
  const controlled = item?.controlled ?? false;
  const witness = line?.wasteWitness?.trim() ? line.wasteWitness.trim() : null;
  const base = {
    drugKey,
    label,
    controlled,
    trayItemId: item?.id ?? null,
    strength: item ? formatStrength(item) : null,
    recorded,
    doses,
    unitsOpened,
    unitsWasted,
    restock: unitsOpened,
    par: item?.quantity ?? null,
    wasteWitness: witness,
    lotNumbers: line?.lotNumbers ?? null,
    // `??`: items frozen by a sign-off before trays had lots carry neither field.
    trayLot: item?.lot ?? null,
    trayExpiry: item?.expiry ?? null,
    note: line?.note ?? null,
    touched: doses > 0 || unitsOpened > 0,
  };
  const problems: Discrepancy[] = [];
  const info: Discrepancy[] = [];
  const show = (n: number, unit: DoseUnit) => `${formatAmount(n)} ${UNIT_WORDS[unit]}`;
  const recordedWords = recorded.map((r) => show(r.total, r.unit)).join(' + ');

  if (!item) {
    // Given from somewhere other than the tray: it cannot be counted against it.
    if (doses > 0 || unitsOpened > 0) {
      problems.push({ kind: 'not-on-tray', message: `${recordedWords || 'Units'} recorded, but this tray holds no ${label}: say where it came from.` });
    }
    const unit = recorded[0]?.unit ?? null;
    const single = recorded.length === 1 ? (recorded[0]?.total ?? null) : null;
    return finish({ ...base, unit, given: single, available: null, leftover: null }, problems, info);
  }

  const unit = item.strengthUnit;
  let given: number | null = 0;
  for (const r of recorded) {
    const converted = convertToItemUnit(r.total, r.unit, item, catalogue);
    if (converted === null) {
      problems.push({
        kind: 'unit-mismatch',
        message: `${show(r.total, r.unit)} recorded cannot be compared with ${formatStrength(item)} units: check the record or the tray item.`,
      });
      given = null;
    } else if (given !== null) {
      given = round(given + converted);
    }
  }
  const available = round((unitsOpened - unitsWasted) * item.strengthAmount);
  const leftover = given === null ? null : round(available - given);

  if (given !== null && leftover !== null) {
    if (leftover < -EPSILON) {
      const units = Math.ceil(given / item.strengthAmount - EPSILON);
      problems.push({
        kind: 'given-more-than-opened',
        message: `${show(given, unit)} given, but only ${show(available, unit)} opened and not wasted (${unitsOpened - unitsWasted} × ${formatStrength(item)}): at least ${units} units were needed.`,
      });
    } else if (leftover >= item.strengthAmount - EPSILON) {
      const whole = Math.floor(leftover / item.strengthAmount + EPSILON);
      problems.push({
        kind: 'opened-not-recorded',
        message:
          given === 0
            ? `${unitsOpened - unitsWasted} opened and not wasted, but none recorded as given.`
            : `${whole} opened unit${whole === 1 ? '' : 's'} more than the ${show(given, unit)} given: record the dose or the waste.`,
      });
    } else if (leftover > EPSILON) {
      info.push({ kind: 'partly-used', message: `${show(leftover, unit)} left in an opened unit: waste it${controlled ? ' with a witness' : ''}.` });
    }
  }
  // Controlled drugs: any waste, whole units or what is left in one, needs a second person.
  const wastes = unitsWasted > 0 || (leftover !== null && leftover > EPSILON);
  if (controlled && wastes && witness === null) {
    problems.push({ kind: 'waste-not-witnessed', message: `${label} is a controlled drug: name the witness to the waste.` });
  }
  return finish({ ...base, unit, given, available, leftover }, problems, info);
}

function finish(
  row: Omit<ReconciledDrug, 'discrepancies' | 'flagged'>,
  problems: Discrepancy[],
  info: Discrepancy[],
): ReconciledDrug {
  const discrepancies = problems.length + info.length > 0 ? [...problems, ...info] : [{ kind: 'balanced' as const, message: row.touched ? 'Given and opened agree.' : 'Nothing given or opened.' }];
  return { ...row, discrepancies, flagged: problems.length > 0 };
}

/** Counts for the worklist and the sign-off: drugs given and rows with a problem. */
export function reconciliationCounts(rows: readonly ReconciledDrug[]): { drugs: number; discrepancies: number } {
  return { drugs: rows.filter((r) => r.doses > 0).length, discrepancies: rows.filter((r) => r.flagged).length };
}

// ---------------------------------------------------------------- answers

export const RECONCILIATION_STATUSES = ['not-started', 'draft', 'signed'] as const;
export type ReconciliationStatus = (typeof RECONCILIATION_STATUSES)[number];

export interface ReconciliationAddendum {
  id: string;
  at: string;
  by: string;
  text: string;
  lines: ReconciliationLineInput[];
}

export interface ReconciliationView {
  code: {
    id: string;
    status: 'active' | 'ended';
    arrestAt: string;
    endedAt: string | null;
    location: string | null;
    unitId: string | null;
    unitName: string | null;
    outcome: string | null;
    /** The record carries at least one signature (recorder or leader). */
    recordSigned: boolean;
    signatures: { printedName: string; meaning: string; signedAt: string }[];
  };
  status: ReconciliationStatus;
  tray: { id: string; name: string } | null;
  /** Trays a pharmacist may choose when the unit has none assigned. */
  trays: { id: string; name: string }[];
  notes: string | null;
  /** The tray items compared against (as signed, once signed). */
  items: TrayItem[];
  lines: ReconciliationLineInput[];
  rows: ReconciledDrug[];
  counts: { drugs: number; discrepancies: number };
  updatedAt: string | null;
  signedBy: string | null;
  signedAt: string | null;
  addenda: ReconciliationAddendum[];
  /** Signed, but the record's drug totals changed since (an addendum to the record): check again. */
  recordChanged: boolean;
  /** The last discrepancy e-mail to the pharmacy lead. */
  mail: { sentAt: string; to: string; status: string } | null;
}

export interface WorklistItem {
  codeId: string;
  arrestAt: string;
  endedAt: string | null;
  location: string | null;
  unitName: string | null;
  outcome: string | null;
  recordSigned: boolean;
  status: Exclude<ReconciliationStatus, 'signed'>;
  drugs: number;
  doses: number;
  discrepancies: number;
}

/**
 * The restock list: items with units to put back, and items whose lot on the tray has expired or
 * expires within 30 days (to swap even when none was opened).
 */
export function restockRows(rows: readonly ReconciledDrug[], today: string): ReconciledDrug[] {
  return rows.filter((r) => r.restock > 0 || expiryNote(r.trayExpiry, today) !== null);
}

/** The restock list's CSV columns, in order (documented in docs/api.md). */
export const RESTOCK_CSV_COLUMNS = [
  'unit',
  'tray',
  'drug',
  'strength',
  'controlled',
  'par_quantity',
  'units_opened',
  'units_wasted',
  'restock_units',
  'lots_used',
  'current_lot',
  'current_expiry',
  'expiry_note',
  'new_lot',
  'new_expiry',
] as const;

// ---------------------------------------------------------------- restock by cart

/** Columns of the cart's restock list: the per-code columns and the codes each line comes from. */
export const CART_RESTOCK_CSV_COLUMNS = [...RESTOCK_CSV_COLUMNS, 'codes'] as const;

/** Days back the cart's restock list reaches when no `since` is given. */
export const CART_RESTOCK_DEFAULT_DAYS = 7;

export const cartRestockQuerySchema = z.object({
  /** Codes whose arrest was on or after this UTC date. */
  since: z.iso.date({ message: 'must be a date, YYYY-MM-DD, e.g. 2026-03-01' }).optional(),
});
export type CartRestockQuery = z.infer<typeof cartRestockQuerySchema>;

/** One code on the cart's unit in the period, with its reconciliation as the per-code page shows it. */
export interface CartRestockCodeInput {
  codeId: string;
  arrestAt: string;
  location: string | null;
  codeStatus: 'active' | 'ended';
  status: ReconciliationStatus;
  /** The tray the reconciliation counted against (as signed). */
  tray: { id: string; name: string } | null;
  rows: readonly ReconciledDrug[];
}

export const CART_LEFT_OUT_REASONS = ['running', 'not-signed-off', 'other-tray'] as const;
export type CartLeftOutReason = (typeof CART_LEFT_OUT_REASONS)[number];

export interface CartRestockCode {
  codeId: string;
  arrestAt: string;
  location: string | null;
}

export interface CartLeftOutCode extends CartRestockCode {
  reason: CartLeftOutReason;
  message: string;
}

export interface CartRestockLine {
  drugKey: string;
  label: string;
  /** "1 mg in 10 mL"; null for a drug that is not on the cart's tray. */
  strength: string | null;
  controlled: boolean;
  onTray: boolean;
  par: number | null;
  unitsOpened: number;
  unitsWasted: number;
  restock: number;
  /** Lot numbers written on the codes' lines, each once, in the order the codes happened. */
  lotsUsed: string[];
  /** Codes that opened this item, oldest arrest first. */
  codeIds: string[];
  /** The lot and expiry on the cart's tray now. */
  trayLot: string | null;
  trayExpiry: string | null;
  expiryNote: ExpiryNote | null;
}

export interface CartRestockSum {
  lines: CartRestockLine[];
  included: CartRestockCode[];
  leftOut: CartLeftOutCode[];
}

export interface CartRestockInput {
  /** The tray the cart carries now: its items give par, strength and the lot on the cart. */
  tray: { id: string; name: string; items: readonly TrayItem[] };
  codes: readonly CartRestockCodeInput[];
  /** YYYY-MM-DD (UTC): for the expiry notes. */
  today: string;
}

/** Why a code's counts are not in the cart's list, or null when they are. */
function leftOutReason(code: CartRestockCodeInput, trayId: string, trayName: string): Omit<CartLeftOutCode, keyof CartRestockCode> | null {
  if (code.codeStatus !== 'ended') return { reason: 'running', message: 'The code is still running: reconcile it after it ends.' };
  if (code.status !== 'signed') {
    const state = code.status === 'draft' ? 'a draft' : 'not started';
    return { reason: 'not-signed-off', message: `The reconciliation is ${state}, not signed off: sign it off to count it here.` };
  }
  if (code.tray?.id !== trayId) {
    return { reason: 'other-tray', message: `Reconciled against ${code.tray ? `the tray "${code.tray.name}"` : 'no tray'}, not "${trayName}".` };
  }
  return null;
}

/**
 * The restock list for a cart over several codes: each signed-off code's restock rows
 * (restockRows, as on the per-code list) summed per drug, one line per item of the tray. Codes
 * still running, not signed off, or counted against another tray are left out, each with why.
 * Items nobody opened are listed when their lot on the tray has expired or expires soon.
 */
export function sumCartRestock(input: CartRestockInput): CartRestockSum {
  const codes = [...input.codes].sort((a, b) => a.arrestAt.localeCompare(b.arrestAt) || a.codeId.localeCompare(b.codeId));
  const included: CartRestockCode[] = [];
  const leftOut: CartLeftOutCode[] = [];
  const sums = new Map<string, { first: ReconciledDrug; opened: number; wasted: number; restock: number; lots: string[]; codeIds: string[] }>();

  for (const code of codes) {
    const ref = { codeId: code.codeId, arrestAt: code.arrestAt, location: code.location };
    const why = leftOutReason(code, input.tray.id, input.tray.name);
    if (why) {
      leftOut.push({ ...ref, ...why });
      continue;
    }
    included.push(ref);
    // Only what the code opened: the expiry flags come from the cart's tray now, below.
    for (const row of restockRows(code.rows, input.today).filter((r) => r.restock > 0)) {
      const sum = sums.get(row.drugKey) ?? { first: row, opened: 0, wasted: 0, restock: 0, lots: [], codeIds: [] };
      sum.opened += row.unitsOpened;
      sum.wasted += row.unitsWasted;
      sum.restock += row.restock;
      for (const lot of (row.lotNumbers ?? '').split(/[,;]/).map((l) => l.trim())) if (lot && !sum.lots.includes(lot)) sum.lots.push(lot);
      sum.codeIds.push(code.codeId);
      sums.set(row.drugKey, sum);
    }
  }

  const items = [...input.tray.items].sort((a, b) => a.sortOrder - b.sortOrder);
  const onTray = items.map((item): CartRestockLine => {
    const sum = sums.get(item.drugKey);
    return {
      drugKey: item.drugKey,
      label: item.label,
      strength: formatStrength(item),
      controlled: item.controlled,
      onTray: true,
      par: item.quantity,
      unitsOpened: sum?.opened ?? 0,
      unitsWasted: sum?.wasted ?? 0,
      restock: sum?.restock ?? 0,
      lotsUsed: sum?.lots ?? [],
      codeIds: sum?.codeIds ?? [],
      trayLot: item.lot ?? null,
      trayExpiry: item.expiry ?? null,
      expiryNote: expiryNote(item.expiry, input.today),
    };
  });
  const tray = new Set(items.map((i) => i.drugKey));
  // Opened from the cart, but not (or no longer) an item of its tray: listed to say so.
  const offTray = [...sums.entries()]
    .filter(([key]) => !tray.has(key))
    .map(([drugKey, sum]): CartRestockLine => ({
      drugKey,
      label: sum.first.label,
      strength: null,
      controlled: sum.first.controlled,
      onTray: false,
      par: null,
      unitsOpened: sum.opened,
      unitsWasted: sum.wasted,
      restock: sum.restock,
      lotsUsed: sum.lots,
      codeIds: sum.codeIds,
      trayLot: null,
      trayExpiry: null,
      expiryNote: null,
    }));
  const lines = [...onTray, ...offTray]
    .filter((l) => l.restock > 0 || l.expiryNote !== null)
    .sort((a, b) => Number(b.controlled) - Number(a.controlled));
  return { lines, included, leftOut };
}

/** The answer of GET /api/pharmacy/carts/:unitId/restock. */
export interface CartRestock extends CartRestockSum {
  unit: { id: string; name: string };
  tray: { id: string; name: string };
  /** The period, by the codes' arrest time: from `since` (00:00 UTC) to `until`. */
  since: string;
  until: string;
}
