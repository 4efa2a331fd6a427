import { randomUUID } from 'node:crypto';
import type { TrayItemInput } from '@steadyhand/shared';
import type { Db } from '../db/database.js';
import { trayItems, trayTemplates, unitTrays } from '../db/schema/index.js';

export const DEMO_TRAY_NAME = 'Adult code cart tray';

/**
 * The demo hospital's tray. Strengths and counts are common practice for an adult code cart
 * (prefilled syringes and vials), no published source; a hospital sets its own.
 */
export const DEMO_TRAY_ITEMS: (TrayItemInput & { volumeMl: number | null })[] = [
  { drugKey: 'epinephrine', label: 'Epinephrine', strengthAmount: 1, strengthUnit: 'mg', volumeMl: 10, quantity: 10 },
  { drugKey: 'amiodarone', label: 'Amiodarone', strengthAmount: 150, strengthUnit: 'mg', volumeMl: 3, quantity: 4 },
  { drugKey: 'adenosine', label: 'Adenosine', strengthAmount: 6, strengthUnit: 'mg', volumeMl: 2, quantity: 5 },
  { drugKey: 'atropine', label: 'Atropine', strengthAmount: 1, strengthUnit: 'mg', volumeMl: 10, quantity: 3 },
  { drugKey: 'calcium-chloride', label: 'Calcium chloride 10%', strengthAmount: 1, strengthUnit: 'g', volumeMl: 10, quantity: 2 },
  // 8.4% is 1 mEq/mL: a 50 mL syringe holds 50 mEq.
  { drugKey: 'sodium-bicarbonate', label: 'Sodium bicarbonate 8.4%', strengthAmount: 50, strengthUnit: 'meq', volumeMl: 50, quantity: 2 },
  { drugKey: 'magnesium-sulfate', label: 'Magnesium sulfate', strengthAmount: 2, strengthUnit: 'g', volumeMl: null, quantity: 2 },
  { drugKey: 'naloxone', label: 'Naloxone', strengthAmount: 0.4, strengthUnit: 'mg', volumeMl: null, quantity: 2 },
  { drugKey: 'dextrose', label: 'Dextrose 50%', strengthAmount: 25, strengthUnit: 'g', volumeMl: 50, quantity: 2 },
  { drugKey: 'lidocaine', label: 'Lidocaine', strengthAmount: 100, strengthUnit: 'mg', volumeMl: 5, quantity: 2 },
];

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/** Inside the demo loader's transaction: the tray, on every demo unit's cart. */
export function seedDemoTray(tx: Tx, unitIds: string[], now: string): void {
  const trayId = randomUUID();
  tx.insert(trayTemplates).values({ id: trayId, name: DEMO_TRAY_NAME, createdAt: now, updatedAt: now }).run();
  DEMO_TRAY_ITEMS.forEach((item, sortOrder) => {
    tx.insert(trayItems).values({ ...item, id: randomUUID(), trayId, controlled: false, sortOrder }).run();
  });
  for (const unitId of unitIds) tx.insert(unitTrays).values({ unitId, trayId }).onConflictDoNothing().run();
}
