import { randomUUID } from 'node:crypto';
import type { TrayItemInput } from '@steadyhand/shared';
import type { Db } from '../db/database.js';
import { trayItems, trayTemplates, unitTrays } from '../db/schema/index.js';

export const DEMO_TRAY_NAME = 'Adult code cart tray';

/**
 * The demo hospital's tray. Strengths and counts are common practice for an adult code cart
 * (prefilled syringes and vials), no published source; a hospital sets its own. Lot numbers are
 * invented; expiry dates count from the day the demo is loaded, and atropine's falls within 30
 * days so the restock list shows its flag.
 */
export const DEMO_TRAY_ITEMS: (Omit<TrayItemInput, 'expiry'> & { volumeMl: number | null; lot: string; expiresInDays: number })[] = [
  { drugKey: 'epinephrine', label: 'Epinephrine', strengthAmount: 1, strengthUnit: 'mg', volumeMl: 10, quantity: 10, lot: 'DEMO-EP-2611', expiresInDays: 240 },
  { drugKey: 'amiodarone', label: 'Amiodarone', strengthAmount: 150, strengthUnit: 'mg', volumeMl: 3, quantity: 4, lot: 'DEMO-AM-0734', expiresInDays: 410 },
  { drugKey: 'adenosine', label: 'Adenosine', strengthAmount: 6, strengthUnit: 'mg', volumeMl: 2, quantity: 5, lot: 'DEMO-AD-1182', expiresInDays: 300 },
  { drugKey: 'atropine', label: 'Atropine', strengthAmount: 1, strengthUnit: 'mg', volumeMl: 10, quantity: 3, lot: 'DEMO-AT-5520', expiresInDays: 20 },
  { drugKey: 'calcium-chloride', label: 'Calcium chloride 10%', strengthAmount: 1, strengthUnit: 'g', volumeMl: 10, quantity: 2, lot: 'DEMO-CA-0291', expiresInDays: 520 },
  // 8.4% is 1 mEq/mL: a 50 mL syringe holds 50 mEq.
  { drugKey: 'sodium-bicarbonate', label: 'Sodium bicarbonate 8.4%', strengthAmount: 50, strengthUnit: 'meq', volumeMl: 50, quantity: 2, lot: 'DEMO-SB-3348', expiresInDays: 180 },
  { drugKey: 'magnesium-sulfate', label: 'Magnesium sulfate', strengthAmount: 2, strengthUnit: 'g', volumeMl: null, quantity: 2, lot: 'DEMO-MG-7716', expiresInDays: 365 },
  { drugKey: 'naloxone', label: 'Naloxone', strengthAmount: 0.4, strengthUnit: 'mg', volumeMl: null, quantity: 2, lot: 'DEMO-NX-4409', expiresInDays: 150 },
  { drugKey: 'dextrose', label: 'Dextrose 50%', strengthAmount: 25, strengthUnit: 'g', volumeMl: 50, quantity: 2, lot: 'DEMO-DX-6053', expiresInDays: 270 },
  { drugKey: 'lidocaine', label: 'Lidocaine', strengthAmount: 100, strengthUnit: 'mg', volumeMl: 5, quantity: 2, lot: 'DEMO-LI-8837', expiresInDays: 330 },
];

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/** Inside the demo loader's transaction: the tray, on every demo unit's cart. */
export function seedDemoTray(tx: Tx, unitIds: string[], now: string): void {
  const trayId = randomUUID();
  tx.insert(trayTemplates).values({ id: trayId, name: DEMO_TRAY_NAME, createdAt: now, updatedAt: now }).run();
  DEMO_TRAY_ITEMS.forEach(({ expiresInDays, ...item }, sortOrder) => {
    const expiry = new Date(Date.parse(now) + expiresInDays * 86_400_000).toISOString().slice(0, 10);
    tx.insert(trayItems).values({ ...item, id: randomUUID(), trayId, controlled: false, sortOrder, expiry }).run();
  });
  for (const unitId of unitIds) tx.insert(unitTrays).values({ unitId, trayId }).onConflictDoNothing().run();
}
