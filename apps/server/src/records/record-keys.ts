import { createPrivateKey, createPublicKey, generateKeyPairSync, sign, verify, type KeyObject } from 'node:crypto';
import { readOrCreateSecret } from '../config/config.js';

/** File name under DATA_DIR/keys. */
export const RECORD_KEY_FILE = 'record-signing-ed25519.pem';

export interface RecordKeys {
  privateKey: KeyObject;
  publicKey: KeyObject;
  publicKeyPem: string;
}

/**
 * The server's Ed25519 key pair for signing records, made on first use and kept in the data
 * folder (private key PEM, mode 600), never in the repository: each installation has its own.
 */
export function loadOrCreateRecordKeys(dataDir: string): RecordKeys {
  const pem = readOrCreateSecret(dataDir, RECORD_KEY_FILE, () =>
    generateKeyPairSync('ed25519').privateKey.export({ format: 'pem', type: 'pkcs8' }).toString(),
  );
  const privateKey = createPrivateKey(pem);
  const publicKey = createPublicKey(privateKey);
  return { privateKey, publicKey, publicKeyPem: publicKey.export({ format: 'pem', type: 'spki' }).toString() };
}

/** Ed25519 over the UTF-8 bytes of a canonical string, as base64url. */
export function signText(privateKey: KeyObject, text: string): string {
  return sign(null, Buffer.from(text, 'utf8'), privateKey).toString('base64url');
}

export function verifyText(publicKey: KeyObject, text: string, signature: string): boolean {
  try {
    return verify(null, Buffer.from(text, 'utf8'), publicKey, Buffer.from(signature, 'base64url'));
  } catch {
    return false;
  }
}
