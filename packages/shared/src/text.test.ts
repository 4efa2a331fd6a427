import { describe, expect, it } from 'vitest';
import { facilitySchema, updateUserSchema } from './admin.js';
import { createCodeSchema, updateCodeSchema } from './codes.js';
import { reviewDetailsSchema } from './records.js';
import { qualityReviewSchema } from './quality.js';
import { reconciliationAddendumSchema } from './reconciliation.js';
import { isWellFormedText, textSchema } from './text.js';

const LONE = '\ud800';

describe('well-formed text', () => {
  it('tells a lone surrogate from a proper pair', () => {
    expect(isWellFormedText('Family present 👪')).toBe(true);
    expect(isWellFormedText(`half ${LONE}`)).toBe(false);
    expect(isWellFormedText('\udc00 low half first')).toBe(false);
    expect(isWellFormedText('\ud83d\udc6a')).toBe(true);
    expect(textSchema().trim().max(10).safeParse(` a${LONE} `).success).toBe(false);
  });

  it('is refused in every text field a code record is made of', () => {
    const bad = [
      createCodeSchema.safeParse({ category: 'adult', patient: { name: LONE } }),
      createCodeSchema.safeParse({ category: 'adult', location: `Bed ${LONE}` }),
      updateCodeSchema.safeParse({ patient: { name: LONE } }),
      updateCodeSchema.safeParse({ patient: { mrn: LONE } }),
      reviewDetailsSchema.safeParse({ team: [{ name: `Dr ${LONE}`, role: 'Leader' }] }),
      reviewDetailsSchema.safeParse({ debriefNotes: LONE }),
      facilitySchema.safeParse({ name: `Harbourview ${LONE}` }),
      updateUserSchema.safeParse({ displayName: LONE }),
      qualityReviewSchema.safeParse({ notes: LONE }),
      reconciliationAddendumSchema.safeParse({ text: LONE }),
    ];
    for (const result of bad) {
      expect(result.success).toBe(false);
      expect(result.error?.issues[0]?.message).toMatch(/well-formed/);
    }
  });
});
