/**
 * A child's weight estimated from age, for when nobody can weigh the child during a code. Always
 * shown and stored as an estimate (weightSource 'estimated-age'); a measured weight or the
 * hospital's length-based tape is better and replaces it.
 *
 * Formulas: the APLS age-based weight formulas as revised in 2011 (Advanced Paediatric Life
 * Support, 5th edition): 0-12 months (0.5 × months) + 4; 1-5 years (2 × years) + 8; 6-12 years
 * (3 × years) + 7. From memory: check against the APLS text and local practice before use.
 */

export const WEIGHT_ESTIMATE_SOURCE =
  'APLS age-based formulas, 2011 revision (0-12 months: 0.5 × months + 4; 1-5 years: 2 × years + 8; 6-12 years: 3 × years + 7); from memory, check before use';

/** Oldest age (years) the formulas cover. */
export const WEIGHT_ESTIMATE_MAX_YEARS = 12;

export interface WeightEstimate {
  weightKg: number;
  /** e.g. "estimate for 4 years: 2 × 4 + 8 = 16 kg". */
  formula: string;
}

/** Estimated weight for an age in months (0 to 12 years); null outside the range. */
export function estimateWeightFromAge(ageMonths: number): WeightEstimate | null {
  if (!Number.isFinite(ageMonths) || ageMonths < 0 || ageMonths > WEIGHT_ESTIMATE_MAX_YEARS * 12) return null;
  if (ageMonths < 12) {
    const kg = 0.5 * ageMonths + 4;
    return { weightKg: kg, formula: `estimate for ${ageMonths} months: 0.5 × ${ageMonths} + 4 = ${kg} kg` };
  }
  const years = Math.floor(ageMonths / 12);
  const kg = years <= 5 ? 2 * years + 8 : 3 * years + 7;
  const rule = years <= 5 ? `2 × ${years} + 8` : `3 × ${years} + 7`;
  return { weightKg: kg, formula: `estimate for ${years} years: ${rule} = ${kg} kg` };
}
