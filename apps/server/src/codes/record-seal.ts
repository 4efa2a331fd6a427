import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { Inject, Injectable } from '@nestjs/common';
import { canonicalText, sha256Hex } from '../common/canonical-json.js';
import { APP_CONFIG } from '../config/config.module.js';
import { readOrCreateSecret, type AppConfig } from '../config/config.js';
import { CHAIN_START } from './entry-chain.js';

/** File name under DATA_DIR/keys. */
export const SEAL_KEY_FILE = 'record-seal-hmac.key';

/** What a record is made of, as the seal counts it. */
export interface SealState {
  /** Links in the code's entry chain. */
  entries: number;
  /** The last link's hash (64 zeros with no entries). */
  head: string;
  signatures: number;
  /** SHA-256 of the attachment list (id and file digest of each, by id). */
  attachments: string;
  /** SHA-256 of the registry-details addenda (each row in full, oldest first); null while there are none. */
  detailAddenda: string | null;
}

export type SealPart = 'entries' | 'signatures' | 'attachments' | 'detailAddenda';

export interface StoredSeal extends SealState {
  codeId: string;
  mac: string;
}

export const EMPTY_SEAL_STATE: SealState = { entries: 0, head: CHAIN_START, signatures: 0, attachments: attachmentsDigest([]), detailAddenda: null };

/** The digest the seal keeps of a code's registry-details addenda; null for none. */
export function detailAddendaDigest(rows: readonly unknown[]): string | null {
  return rows.length === 0 ? null : sha256Hex(canonicalText(rows));
}

export function attachmentsDigest(list: readonly { id: string; sha256: string }[]): string {
  const sorted = [...list].sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0)).map((a) => ({ id: a.id, sha256: a.sha256 }));
  return sha256Hex(canonicalText(sorted));
}

/** The parts of two states that differ. */
export function differingParts(a: SealState, b: SealState): SealPart[] {
  const parts: SealPart[] = [];
  if (a.entries !== b.entries || a.head !== b.head) parts.push('entries');
  if (a.signatures !== b.signatures) parts.push('signatures');
  if (a.attachments !== b.attachments) parts.push('attachments');
  if ((a.detailAddenda ?? null) !== (b.detailAddenda ?? null)) parts.push('detailAddenda');
  return parts;
}

/**
 * The server's key for record seals, made on first start and kept in the data folder (mode 600).
 * `createdNow` tells the first start with seals: the only time records are sealed as they are
 * found (older databases), and entries without a link are linked.
 */
@Injectable()
export class SealKey {
  private readonly key: Buffer;
  readonly createdNow: boolean;

  constructor(@Inject(APP_CONFIG) config: AppConfig) {
    this.createdNow = !existsSync(path.join(config.dataDir, 'keys', SEAL_KEY_FILE));
    this.key = Buffer.from(readOrCreateSecret(config.dataDir, SEAL_KEY_FILE, () => randomBytes(32).toString('base64url')), 'base64url');
  }

  mac(codeId: string, state: SealState): string {
    // Registry-details addenda join the sealed text only once there are some, so seals made before them still verify.
    const text = canonicalText({
      format: 'steadyhand-seal/1',
      codeId,
      entries: state.entries,
      head: state.head,
      signatures: state.signatures,
      attachments: state.attachments,
      ...(state.detailAddenda ? { detailAddenda: state.detailAddenda } : {}),
    });
    return createHmac('sha256', this.key).update(text, 'utf8').digest('hex');
  }

  verifies(seal: StoredSeal): boolean {
    const expected = Buffer.from(this.mac(seal.codeId, seal), 'hex');
    const given = Buffer.from(seal.mac, 'hex');
    return given.length === expected.length && timingSafeEqual(given, expected);
  }
}
