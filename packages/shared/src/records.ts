import { z } from 'zod';
import { textSchema } from './text.js';
import { patientSchema, type Code } from './codes.js';
import { OUTCOMES, type StoredEntry } from './entries.js';
import { utsteinPatchSchema, type UtsteinAddendum, type UtsteinDetails } from './utstein.js';

/**
 * The signed record: review details completed after the code, signatures and their meanings
 * (21 CFR 11.50: printed name, date and time, meaning), and the verification answer.
 */

export const teamMemberSchema = z
  .object({
    name: textSchema().trim().min(1, 'name is required').max(120),
    role: textSchema().trim().min(1, 'role is required').max(60),
  })
  .strict();
export type TeamMember = z.infer<typeof teamMemberSchema>;

/**
 * Details completed at review. Refused once the record carries a signature (then: addenda),
 * except `utstein`: its changes after the first signature are kept as addenda of their own.
 */
export const reviewDetailsSchema = z
  .object({
    team: z.array(teamMemberSchema).max(40).optional(),
    debriefNotes: textSchema().trim().max(5000).nullable().optional(),
    outcome: z.enum(OUTCOMES).optional(),
    patient: patientSchema.nullable().optional(),
    location: textSchema().trim().max(120).nullable().optional(),
    /** The registry details (utstein.ts): a field sent replaces, null clears, one left out stays. */
    utstein: utsteinPatchSchema.optional(),
  })
  .strict()
  .refine((v) => Object.keys(v).length > 0, 'Send at least one field to change');
export type ReviewDetailsRequest = z.infer<typeof reviewDetailsSchema>;

export const SIGNATURE_MEANINGS = ['recorded-by', 'reviewed-confirmed'] as const;
export type SignatureMeaning = (typeof SIGNATURE_MEANINGS)[number];

/** The words printed beside each signature, on screen and on paper. */
export const SIGNATURE_MEANING_TEXT = {
  'recorded-by': 'Recorded by',
  'reviewed-confirmed': 'Reviewed and confirmed by',
} as const satisfies Record<SignatureMeaning, string>;

/** The role a person must hold to sign with each meaning. */
export const SIGNATURE_MEANING_ROLE = {
  'recorded-by': 'recorder',
  'reviewed-confirmed': 'leader',
} as const satisfies Record<SignatureMeaning, 'recorder' | 'leader'>;

export const signRecordSchema = z
  .object({
    meaning: z.enum(SIGNATURE_MEANINGS),
    password: textSchema().min(1, 'password is required').max(1024),
  })
  .strict();
export type SignRecordRequest = z.infer<typeof signRecordSchema>;

export const RECORD_STATUSES = ['draft', 'partly-signed', 'signed'] as const;
export type RecordStatus = (typeof RECORD_STATUSES)[number];

export interface RecordSignature {
  printedName: string;
  meaning: SignatureMeaning;
  meaningText: (typeof SIGNATURE_MEANING_TEXT)[SignatureMeaning];
  signedAt: string;
  /** The server signature verifies, names this record, and its digest is the record as it was at signing. */
  valid: boolean;
  /** Who signed (a user id); on the record's own view, so a screen can tell "you signed this". */
  signerId?: string;
  /**
   * The server key that made the signature (`GET /api/records/public-keys`); a signature stored
   * before key ids existed names the installation's first key. On the record view and verification.
   */
  keyId?: string;
}

/**
 * One of the server's Ed25519 keys for records, as `GET /api/records/public-keys` lists them:
 * `keyId` is the first 16 hex digits of `fingerprint`, the SHA-256 of the key's DER
 * SubjectPublicKeyInfo. A key signs from `validFrom` (null: the first key of an installation made
 * before key ids, in use since it was installed) until `validUntil` (null: the key signing now).
 */
export interface RecordPublicKey {
  keyId: string;
  algorithm: 'Ed25519';
  fingerprint: string;
  publicKeyPem: string;
  validFrom: string | null;
  validUntil: string | null;
  current: boolean;
}

/** `GET /api/records/public-keys`: oldest first; the last one signs now. */
export interface RecordPublicKeys {
  keys: RecordPublicKey[];
}

export const RECORD_FORMAT = 'steadyhand-record/1';

export interface RecordAttachment {
  id: string;
  sha256: string;
  filename: string;
  mediaType: string;
  sizeBytes: number;
  uploadedAt: string;
}

/** An attachment as the attachments routes list it: the record's fields, plus who uploaded it. */
export interface CodeAttachment extends RecordAttachment {
  codeId: string;
  /** The uploader's display name. */
  uploadedBy: string;
}

/** Attachment types the server accepts, checked from the bytes. */
export const ATTACHMENT_MEDIA_TYPES = ['image/png', 'image/jpeg', 'image/webp', 'application/pdf'] as const;

/**
 * The code as its record holds it. `utstein`: the registry details as completed before the first
 * signature (absent when none were entered, so records signed before they existed keep their digest).
 */
export type RecordCode = Code & { team: TeamMember[]; debriefNotes: string | null; utstein?: UtsteinDetails };

/** Everything the signatures and the digest cover. */
export interface CanonicalRecord {
  format: typeof RECORD_FORMAT;
  facility: string;
  code: RecordCode;
  /** Every stored entry (corrections and addenda included) in cursor order, with the server's fields. */
  entries: StoredEntry[];
  attachments: RecordAttachment[];
  /** Changes to the registry details after the first signature, oldest first; absent when none. */
  detailAddenda?: UtsteinAddendum[];
}

/** Where a code's entry chain first fails to check. */
export interface EntryChainBreak {
  /** 1-based position in the log (cursor order). */
  position: number;
  /** The entry at that position (or, past the end of the log, the entry the stray link names). */
  entryId: string;
  reason: string;
}

/**
 * The hash chain over a code's entry log (one link per entry, each hash covering the previous
 * hash and the stored entry), checked from the stored rows. `length`: links stored for the code;
 * `head`: the last link's hash (null with no links). When `valid`, `length` is the number of
 * entries and `head` commits to the whole log.
 */
export type EntryChainStatus =
  | { valid: true; length: number; head: string | null }
  | { valid: false; length: number; head: string | null; brokenAt: EntryChainBreak };

/**
 * Every check of a record against tampering, as of now: the entry chain, the server's seal
 * (entries, signatures, attachments), each signature, each attachment's file, and that entries
 * stored after the first signature are addenda. `problems` says in words what failed.
 */
export interface RecordIntegrity {
  valid: boolean;
  problems: string[];
}

/** `GET /api/codes/:id/record`: the record, its digest now, its signatures and who wrote what. */
export interface RecordView {
  record: CanonicalRecord;
  digest: string;
  /** The entry chain as checked now (not part of the record, so not covered by its digest). */
  chain: EntryChainStatus;
  integrity: RecordIntegrity;
  signatures: RecordSignature[];
  status: RecordStatus;
  /**
   * userId → display name, for everyone who wrote an entry or signed: the name kept with their
   * entries when it was (a later rename changes nothing), else their name now.
   */
  people: Record<string, string>;
  /** When the code's quality review was signed off (its registry details are closed then), or null. */
  qualityReviewedAt: string | null;
}

/** `GET /api/records`: ended codes, newest first, with how far their record is signed. */
export interface RecordListItem {
  code: Code;
  status: RecordStatus;
  signatures: Pick<RecordSignature, 'printedName' | 'meaning' | 'meaningText' | 'signedAt'>[];
}

/** Verify by digest (and, optionally, the record id printed on the copy). */
export const verifyRecordSchema = z
  .object({
    digest: textSchema()
      .trim()
      .toLowerCase()
      .regex(/^[0-9a-f]{64}$/, 'digest must be 64 hexadecimal characters (SHA-256)'),
    recordId: textSchema().trim().min(1).max(64).optional(),
  })
  .strict();
export type VerifyRecordRequest = z.infer<typeof verifyRecordSchema>;

export interface VerifyRecordResult {
  valid: boolean;
  reason: string;
  record?: {
    id: string;
    location: string | null;
    arrestAt: string;
    status: RecordStatus;
    signatures: RecordSignature[];
  };
}
