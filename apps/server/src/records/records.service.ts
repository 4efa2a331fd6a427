import { randomUUID } from 'node:crypto';
import {
  ConflictException,
  ForbiddenException,
  Inject,
  Injectable,
  NotFoundException,
  Optional,
  type OnModuleInit,
} from '@nestjs/common';
import {
  applyUtsteinPatch,
  hasAnyRole,
  liveEntries,
  utsteinChanges,
  utsteinProblems,
  WRITER_ROLES,
  SIGNATURE_MEANING_ROLE,
  SIGNATURE_MEANING_TEXT,
  type NewEntry,
  type RecordListItem,
  type RecordPublicKeys,
  type RecordSignature,
  type RecordView,
  type RecordStatus,
  type ReviewDetailsRequest,
  type SignRecordRequest,
  type StoredEntry,
  type UtsteinAddendum,
  type UtsteinDetails,
  type VerifyRecordRequest,
  type VerifyRecordResult,
} from '@steadyhand/shared';
import { AuditService } from '../audit/audit.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { verifyEntryChain } from '../codes/entry-chain.js';
import { EntriesService } from '../codes/entries.service.js';
import { EntryEvents } from '../codes/entry-events.js';
import { RecordSealService } from '../codes/record-seal.service.js';
import { AttachmentsService } from '../attachments/attachments.service.js';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';
import { MailService } from '../mail/mail.service.js';
import type { PasswordAttempt } from '../auth/login-throttle.service.js';
import { PasswordCheckService } from '../auth/password-check.service.js';
import { CodesService } from '../codes/codes.service.js';
import { fieldProblemsError } from '../common/zod-validation.pipe.js';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { inArray } from 'drizzle-orm';
import { users } from '../db/schema/index.js';
import { NotCanonicalisable } from '../common/canonical-json.js';
import {
  formatPdfStamp,
  pdfStampText,
  readPdfStamp,
  recordAsOf,
  recordDigest,
  RECORD_FORMAT,
  sha256Hex,
  signaturePayloadText,
  type CanonicalRecord,
  type RecordCode,
} from './record-canonical.js';
import { keyFor, loadRecordKeyRing, periodText, publicKeyView, signText, verifyText, withinPeriod, type RecordKeyRing } from './record-keys.js';
import { buildRecordPdf, renderPdf } from './record-pdf.js';
import { SignaturesRepository, type SignatureRow } from './signatures.repository.js';

/**
 * Code fields added after records were first signed (how the weight was obtained, the protocol
 * version, a category switch) join the canonical record only when set, so a record signed before
 * they existed keeps its digest and its signatures keep verifying.
 */
const LATER_CODE_FIELDS = ['weightSource', 'protocolVersion', 'categoryChangedAt', 'utstein'] as const;

function withoutUnsetLaterFields(code: RecordCode): RecordCode {
  const copy: Record<string, unknown> = { ...code };
  for (const k of LATER_CODE_FIELDS) if (copy[k] === null || copy[k] === undefined) delete copy[k];
  return copy as RecordCode;
}

@Injectable()
export class RecordsService implements OnModuleInit {
  private keys: RecordKeyRing | undefined;

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(DB) private readonly db: Db,
    @Inject(EntriesService) private readonly entries: EntriesService,
    @Inject(SignaturesRepository) private readonly signatures: SignaturesRepository,
    @Inject(CodesService) private readonly codes: CodesService,
    @Inject(PasswordCheckService) private readonly passwords: PasswordCheckService,
    @Inject(AuditService) private readonly audit: AuditService,
    @Inject(RecordSealService) private readonly seals: RecordSealService,
    @Inject(EntryEvents) private readonly events: EntryEvents,
    @Optional() @Inject(AttachmentsService) private readonly attachments?: AttachmentsService,
    // Optional, so the records feature works (and its tests run) in an app without the mail module.
    @Optional() @Inject(MailService) private readonly mail?: MailService,
  ) {}

  /** A missing or mismatched signing key stops the start, saying what to do, rather than the first signature. */
  onModuleInit(): void {
    this.recordKeys();
  }

  /**
   * Every public key the server has signed records with and the private key signing now, read
   * once: `pnpm keys:rotate` runs with the server stopped, so the next start reads the new key.
   */
  private recordKeys(): RecordKeyRing {
    this.keys ??= loadRecordKeyRing(this.config.dataDir);
    return this.keys;
  }

  /** The key signing now. */
  publicKeyPem(): string {
    return this.recordKeys().current.publicKeyPem;
  }

  /** Every key, oldest first, with the period it signed in. */
  publicKeys(): RecordPublicKeys {
    const ring = this.recordKeys();
    return { keys: ring.keys.map((key) => publicKeyView(key, ring)) };
  }

  /** Not before the current key began, so what it signs is always dated within its period. */
  private signingTime(at: number): string {
    const from = this.recordKeys().current.validFrom;
    return new Date(from === null ? at : Math.max(at, Date.parse(from))).toISOString();
  }

  // --- the record ----------------------------------------------------------------------------

  private recordCode(id: string): RecordCode {
    const code = this.codes.find(id);
    const details = this.codes.reviewDetails(id);
    if (!code || !details) throw new NotFoundException(`No code with id ${id}`);
    const utstein = this.codes.storedUtsteinOf(id);
    return withoutUnsetLaterFields({ ...code, team: details.team ?? [], debriefNotes: details.debriefNotes, ...(utstein ? { utstein } : {}) });
  }

  canonicalRecord(id: string): CanonicalRecord {
    const code = this.recordCode(id);
    const addenda = this.codes.detailAddendaOf(id);
    return {
      format: RECORD_FORMAT,
      // As first signed, once signed: a rename of the facility since changes nothing.
      facility: this.codes.frozenFacility(id) ?? this.signatures.facility().name,
      code,
      entries: this.codes.entriesOf(id),
      attachments: this.signatures.attachmentsOf(id),
      // Only when there are some, so records without them keep the shape (and digest) they were signed with.
      ...(addenda.length ? { detailAddenda: addenda } : {}),
    };
  }

  /**
   * A person's signature counts when the server's Ed25519 signature verifies, with the key it
   * names and dated within that key's period, over its own fields (the record id included, so a
   * copied row fails) and its digest is the record as it stood when it was signed (so any changed
   * byte since fails). `problem` says why not, when it is about the key.
   */
  private signatureCheck(row: SignatureRow, record: CanonicalRecord): { valid: boolean; keyId: string | undefined; problem?: string } {
    const key = keyFor(this.recordKeys(), row.keyId);
    const what = `The "${SIGNATURE_MEANING_TEXT[row.meaning]}" signature of ${row.printedName}`;
    if (!key) {
      return {
        valid: false,
        keyId: row.keyId ?? undefined,
        problem: `${what} was made with server key ${row.keyId}, which this server does not hold: put the list of public keys in DATA_DIR/keys back from where it is kept (docs/operations.md, "Key rotation").`,
      };
    }
    if (!withinPeriod(key, row.signedAt)) {
      return { valid: false, keyId: key.keyId, problem: `${what} is dated ${row.signedAt}, outside the period of server key ${key.keyId} (${periodText(key)}).` };
    }
    const payload = signaturePayloadText({
      recordId: row.codeId,
      digest: row.recordDigest,
      signerId: row.userId,
      printedName: row.printedName,
      meaning: row.meaning,
      signedAt: row.signedAt,
    });
    const valid =
      row.codeId === record.code.id && verifyText(key.publicKey, payload, row.serverSignature) && recordDigest(recordAsOf(record, row.signedAt)) === row.recordDigest;
    return { valid, keyId: key.keyId };
  }

  private statusOf(rows: SignatureRow[]): RecordStatus {
    const meanings = new Set(rows.map((r) => r.meaning));
    return meanings.size === 0 ? 'draft' : meanings.has('recorded-by') && meanings.has('reviewed-confirmed') ? 'signed' : 'partly-signed';
  }

  /**
   * Runs work that canonicalises the record. A record holding something RFC 8785 cannot serialise
   * (stored before the schemas refused it) answers 409 saying which field, never a 500.
   */
  private canonical<T>(work: () => T): T {
    try {
      return work();
    } catch (err) {
      if (!(err instanceof NotCanonicalisable)) throw err;
      throw new ConflictException({
        statusCode: 409,
        error: 'record-not-canonical',
        message: `This record cannot be canonicalised (RFC 8785), so it cannot be shown, printed, signed or verified: record.${err.message}. Correct that detail of the code; stored entries stay as they were written.`,
      });
    }
  }

  async view(id: string): Promise<RecordView> {
    const view = this.canonical(() => this.buildView(id));
    // The attachments' files are read and hashed again on every view: the record lists digests.
    const fileProblems = this.attachments ? await this.attachments.fileProblems(id) : [];
    if (fileProblems.length) view.integrity = { valid: false, problems: [...view.integrity.problems, ...fileProblems] };
    return view;
  }

  private buildView(id: string): RecordView {
    const record = this.canonicalRecord(id);
    const rows = this.signatures.ofCode(id);
    const chain = verifyEntryChain(record.entries, this.codes.linksOf(id));
    const checks = rows.map((r) => this.signatureCheck(r, record));
    const signatures = rows.map((r, i) => ({
      printedName: r.printedName,
      meaning: r.meaning,
      meaningText: SIGNATURE_MEANING_TEXT[r.meaning],
      signedAt: r.signedAt,
      valid: checks[i]!.valid,
      signerId: r.userId,
      keyId: checks[i]!.keyId,
    }));
    const problems = [
      ...(chain.valid ? [] : [`The entry chain is broken at position ${chain.brokenAt.position} (entry ${chain.brokenAt.entryId}): ${chain.brokenAt.reason}.`]),
      ...this.seals.problems(id),
      ...signatures.flatMap((sig, i) => (sig.valid ? [] : [checks[i]!.problem ?? `The "${sig.meaningText}" signature of ${sig.printedName} does not verify against this record.`])),
      ...addendumProblems(record, rows),
    ];
    return {
      record,
      digest: recordDigest(record),
      chain,
      integrity: { valid: problems.length === 0, problems },
      signatures,
      status: this.statusOf(rows),
      people: Object.fromEntries(this.peopleOf(record, rows)),
      qualityReviewedAt: this.signatures.qualitySignedOffAt(id),
    };
  }

  /** Ended codes, newest first, each with how far its record is signed (for "records to sign"). */
  list(limit = 200): RecordListItem[] {
    const codes = this.codes.list('ended', limit);
    const signaturesByCode = this.signatures.ofCodes(codes.map((c) => c.id));
    return codes.map((code) => {
      const rows = signaturesByCode.get(code.id) ?? [];
      return {
        code,
        status: this.statusOf(rows),
        signatures: rows.map((r) => ({ printedName: r.printedName, meaning: r.meaning, meaningText: SIGNATURE_MEANING_TEXT[r.meaning], signedAt: r.signedAt })),
      };
    });
  }

  // --- review details ------------------------------------------------------------------------

  /**
   * Review details. Recorders and leaders change any of them until the first signature; the
   * registry details (`utstein`) may also be changed by a reviewer or admin, and after the first
   * signature are kept as addenda (the signed details stay as signed), until the quality review
   * is signed off.
   */
  updateReview(user: SessionUser, id: string, changes: ReviewDetailsRequest): { code: RecordCode; utstein: UtsteinDetails; utsteinAddenda: UtsteinAddendum[] } {
    const before = this.recordCode(id);
    const { utstein: patch, ...rest } = changes;
    const writer = hasAnyRole(user.roles, [...WRITER_ROLES]);
    if (!writer && Object.keys(rest).length > 0) {
      throw new ForbiddenException(`A reviewer changes only the registry details (utstein); ${Object.keys(rest).join(', ')} are completed by the recorder or the team leader`);
    }
    if (!writer && before.status !== 'ended') throw new ConflictException('The code has not ended: its registry details are completed after it ends');
    const signed = this.codes.isSigned(id);
    if (signed && Object.keys(rest).length > 0) throw new ConflictException('This record is signed: add an addendum');
    if (patch) {
      const closedAt = this.signatures.qualitySignedOffAt(id);
      if (closedAt) throw new ConflictException(`The quality review of this code was signed off on ${closedAt}: its registry details are closed`);
    }

    const { outcome, ...details } = rest;
    if (outcome !== undefined && outcome !== before.outcome) this.confirmOutcome(user, id, outcome);
    if (Object.keys(details).length > 0) {
      this.codes.updateReviewFields(id, {
        ...(details.team !== undefined ? { team: details.team } : {}),
        ...(details.debriefNotes !== undefined ? { debriefNotes: details.debriefNotes || null } : {}),
        ...(details.patient !== undefined ? { patient: details.patient } : {}),
        ...(details.location !== undefined ? { location: details.location } : {}),
      });
    }
    const utsteinChanged = patch ? this.changeUtstein(user, id, patch, signed) : {};
    const after = this.recordCode(id);
    const changed: Record<string, unknown> = Object.fromEntries(
      Object.keys(rest).map((k) => [k, { from: before[k as keyof RecordCode] ?? null, to: after[k as keyof RecordCode] ?? null }]),
    );
    if (Object.keys(utsteinChanged).length > 0) {
      changed.utstein = utsteinChanged;
      if (signed) changed.addendum = true;
    }
    if (Object.keys(changed).length > 0) {
      this.audit.record({ action: 'code.review-changed', userId: user.id, username: user.username, codeId: id, detail: changed });
    }
    // The quality targets read witnessed and monitored: the code's metrics follow.
    if (Object.keys(utsteinChanged).length > 0) this.events.emitCodesChanged(id);
    const state = this.codes.utsteinState(id);
    return { code: after, utstein: state.now, utsteinAddenda: state.addenda };
  }

  /** Checks the details as they would read, then stores them (unsigned) or an addendum (signed). */
  private changeUtstein(user: SessionUser, id: string, patch: NonNullable<ReviewDetailsRequest['utstein']>, signed: boolean): UtsteinAddendum['changes'] {
    const code = this.codes.get(id);
    const state = this.codes.utsteinState(id);
    const next = applyUtsteinPatch(state.now, patch);
    const problems = utsteinProblems(next, code);
    if (problems.length > 0) throw fieldProblemsError(problems);
    const changes = utsteinChanges(state.now, next);
    if (Object.keys(changes).length === 0) return changes;
    if (!signed) {
      this.codes.setUtstein(id, next);
    } else {
      this.codes.addDetailAddendum(id, { id: randomUUID(), recordedAt: new Date().toISOString(), userId: user.id, userName: user.displayName, changes });
    }
    return changes;
  }

  /**
   * The outcome belongs to the log (the end entry): confirming another one at review amends the
   * end entry, so the summary, the code row and the PDF all agree and the original stays visible.
   */
  private confirmOutcome(user: SessionUser, id: string, outcome: NonNullable<ReviewDetailsRequest['outcome']>): void {
    const end = liveEntries(this.codes.entriesOf(id)).find((e) => e.kind === 'end');
    if (!end || end.kind !== 'end') throw new ConflictException('The code has not ended: record its end before confirming the outcome');
    if (end.outcome === outcome) return;
    const amend: NewEntry = {
      id: randomUUID(),
      kind: 'amend',
      at: new Date().toISOString(),
      target: end.id,
      changes: { outcome },
      reason: 'Outcome confirmed at review',
      deviceId: 'review',
    };
    this.entries.add(user, id, amend);
  }

  // --- signing -------------------------------------------------------------------------------

  async sign(user: SessionUser, id: string, body: SignRecordRequest, attempt: PasswordAttempt): Promise<{ signature: RecordSignature; status: RecordStatus }> {
    const code = this.recordCode(id);
    if (code.status !== 'ended') throw new ConflictException('The code has not ended: a record is signed after the code ends');
    const role = SIGNATURE_MEANING_ROLE[body.meaning];
    if (!hasAnyRole(user.roles, [role])) {
      throw new ForbiddenException(`Only a person with the ${role} role can sign as "${SIGNATURE_MEANING_TEXT[body.meaning]}"`);
    }
    const existing = this.signatures.ofCode(id);
    if (existing.some((r) => r.meaning === body.meaning)) {
      throw new ConflictException(`This record already has a "${SIGNATURE_MEANING_TEXT[body.meaning]}" signature`);
    }
    // A review by the person who recorded is no second pair of eyes.
    if (existing.some((r) => r.userId === user.id)) {
      throw new ConflictException('You have already signed this record: the other signature must come from another person');
    }

    // 21 CFR 11.200: the password again at the moment of signing.
    await this.passwords.confirm(user, body.password, attempt, { failedAction: 'record.sign-failed', codeId: id, detail: { meaning: body.meaning } });

    // After the await: checked again, since another signature may have landed meanwhile.
    if (this.signatures.ofCode(id).some((r) => r.meaning === body.meaning || r.userId === user.id)) {
      throw new ConflictException(`This record already has a "${SIGNATURE_MEANING_TEXT[body.meaning]}" signature`);
    }
    const printedName = user.displayName;
    // One transaction: the facility name kept with the record at its first signature, the record
    // read and signed, the signature stored and counted in the record's seal.
    const { signatureRow, digest, signedAt } = this.seals.sealedWrite(id, 'signatures', () => {
      if (existing.length === 0) this.codes.freezeFacility(id, this.signatures.facility().name);
      const record = this.canonicalRecord(id);
      const digest = this.canonical(() => recordDigest(record));
      // Not earlier than any stored entry, so the record "as of" this signature holds all it signed.
      const latest = Math.max(Date.now(), ...record.entries.map((e) => Date.parse(e.recordedAt)), ...record.attachments.map((a) => Date.parse(a.uploadedAt)));
      const signedAt = this.signingTime(latest);
      const key = this.recordKeys().current;
      const serverSignature = signText(key.privateKey, signaturePayloadText({ recordId: id, digest, signerId: user.id, printedName, meaning: body.meaning, signedAt }));
      const signatureRow: SignatureRow = { id: randomUUID(), codeId: id, userId: user.id, printedName, meaning: body.meaning, signedAt, recordDigest: digest, serverSignature, keyId: key.keyId };
      this.signatures.insert(signatureRow);
      return { signatureRow, digest, signedAt };
    });
    this.audit.record({
      action: 'record.signed',
      userId: user.id,
      username: user.username,
      codeId: id,
      detail: { signatureId: signatureRow.id, meaning: body.meaning, printedName, signedAt, digest, keyId: signatureRow.keyId },
    });

    const rows = this.signatures.ofCode(id);
    const status = this.statusOf(rows);
    if (status === 'signed') this.notifySigned(id, rows);
    return {
      signature: { printedName, meaning: body.meaning, meaningText: SIGNATURE_MEANING_TEXT[body.meaning], signedAt, valid: true, keyId: signatureRow.keyId ?? undefined },
      status,
    };
  }

  /**
   * Tells pharmacy and reviewers that a record is ready. Not awaited: the mail service records
   * every failure in mail_log and never rejects, and a slow relay must not hold up the signer.
   */
  private notifySigned(codeId: string, rows: SignatureRow[]): void {
    if (!this.mail) return;
    const link = `${this.config.publicOrigin}/codes/${codeId}/review`;
    const signers = rows.map((r) => `${r.printedName} (${SIGNATURE_MEANING_TEXT[r.meaning]})`);
    void this.mail.sendRecordSigned({ codeId, link, signers });
  }

  // --- addenda -------------------------------------------------------------------------------

  addAddendum(user: SessionUser, id: string, entry: NewEntry): { entry: StoredEntry; duplicate: boolean } {
    return this.entries.add(user, id, entry, new Date().toISOString(), { addendum: true });
  }

  // --- the printed copy ----------------------------------------------------------------------

  async pdf(user: SessionUser, id: string): Promise<{ buffer: Buffer; filename: string }> {
    const view = await this.view(id);
    const { record, digest } = view;
    // The code's own protocol version: an admin's later change never alters its record.
    const timeline = this.codes.timelineOf(record.code, record.entries);
    const generatedAt = this.signingTime(Date.now());
    const key = this.recordKeys().current;
    const signature = signText(key.privateKey, pdfStampText({ recordId: id, digest, generatedAt }));
    const definition = buildRecordPdf({
      record,
      digest,
      chain: view.chain,
      integrity: view.integrity,
      status: view.status,
      timeline,
      signatures: view.signatures,
      people: this.peopleOf(record),
      timeZone: this.timeZone(),
      generatedAt,
      keyId: key.keyId,
      stamp: formatPdfStamp({ recordId: id, digest, signature, generatedAt, keyId: key.keyId }),
    });
    const buffer = await renderPdf(definition);
    // The file's own hash, so verification can tell this exact file from an edited one.
    this.audit.record({
      action: 'record.printed',
      userId: user.id,
      username: user.username,
      codeId: id,
      detail: { digest, generatedAt, status: view.status, fileSha256: sha256Hex(buffer), keyId: key.keyId },
    });
    return { buffer, filename: `steadyhand-record-${id}.pdf` };
  }

  private timeZone(): string {
    const configured = this.signatures.facility().timeZone;
    if (configured) {
      try {
        new Intl.DateTimeFormat('en-GB', { timeZone: configured });
        return configured;
      } catch {
        // An unknown zone name falls back to the server's.
      }
    }
    return Intl.DateTimeFormat().resolvedOptions().timeZone;
  }

  /**
   * Names for the people of a record: the name kept with their entries (as they were named when
   * they wrote, so a rename since changes nothing), else, for entries stored before names were
   * kept and for signers, their name now.
   */
  private peopleOf(record: CanonicalRecord, signatureRows: SignatureRow[] = []): Map<string, string> {
    const names = new Map<string, string>();
    for (const e of record.entries) if (e.userName && !names.has(e.userId)) names.set(e.userId, e.userName);
    const ids = [...new Set([...record.entries.map((e) => e.userId), ...signatureRows.map((r) => r.userId)])].filter((id) => !names.has(id));
    if (ids.length === 0) return names;
    const rows = this.db.select({ id: users.id, displayName: users.displayName }).from(users).where(inArray(users.id, ids)).all();
    for (const r of rows) names.set(r.id, r.displayName);
    return names;
  }

  // --- verification --------------------------------------------------------------------------

  async verifyPdf(bytes: Buffer): Promise<VerifyRecordResult> {
    if (bytes.subarray(0, 5).toString('latin1') !== '%PDF-') return { valid: false, reason: 'This file is not a PDF.' };
    const stamp = readPdfStamp(bytes);
    if (!stamp) return { valid: false, reason: 'This PDF carries no Steadyhand record stamp: it was not made by Steadyhand, or its metadata was removed.' };
    // A copy printed before key ids were stamped was made by the first key.
    const key = keyFor(this.recordKeys(), stamp.keyId);
    if (!key) {
      return {
        valid: false,
        reason: `This file was stamped with server key ${stamp.keyId}, which this server does not hold: it was made by another server, or this server's list of public keys was lost (docs/operations.md, "Key rotation").`,
      };
    }
    if (!verifyText(key.publicKey, pdfStampText(stamp), stamp.signature)) {
      return { valid: false, reason: "The server signature in this file does not verify: the file was altered, or it was not made by this server." };
    }
    if (!withinPeriod(key, stamp.generatedAt)) {
      return { valid: false, reason: `This file is dated ${stamp.generatedAt}, outside the period of server key ${key.keyId} that stamped it (${periodText(key)}).` };
    }
    const result = await this.verifyAgainst(stamp.recordId, stamp.digest);
    if (!result.valid || !result.record) return result;
    const issued = this.signatures.findIssuedCopy(stamp.recordId, sha256Hex(bytes));
    if (!issued) {
      return {
        ...result,
        valid: false,
        reason: 'The record is unchanged, but this file is not byte for byte a copy the server issued: its pages may have been edited. Print a fresh copy.',
      };
    }
    return { ...result, reason: `${result.reason} This file is the copy issued on ${issued.at}.` };
  }

  async verifyDigest(body: VerifyRecordRequest): Promise<VerifyRecordResult> {
    const candidates = body.recordId ? [body.recordId] : this.signatures.codesSignedWithDigest(body.digest);
    if (candidates.length === 0) {
      return { valid: false, reason: 'No signed record has this digest. Enter the record id printed on the copy as well, or upload the PDF.' };
    }
    // A digest alone may name a record that changed since: the first candidate that still matches wins.
    const results = await Promise.all(candidates.map((id) => this.verifyAgainst(id, body.digest)));
    return results.find((r) => r.valid) ?? results[0]!;
  }

  private async verifyAgainst(recordId: string, digest: string): Promise<VerifyRecordResult> {
    if (!this.codes.find(recordId)) return { valid: false, reason: 'No record with this id on this server.' };
    let view: RecordView;
    try {
      view = await this.view(recordId);
    } catch (err) {
      if (err instanceof ConflictException) return { valid: false, reason: String((err.getResponse() as { message: string }).message) };
      throw err;
    }
    const summary = {
      id: recordId,
      location: view.record.code.location,
      arrestAt: view.record.code.arrestAt,
      status: view.status,
      signatures: view.signatures,
    };
    // First: an entry changed in place also changes the digest, and the chain says which one.
    const { chain } = view;
    if (!chain.valid) {
      const { position, entryId, reason } = chain.brokenAt;
      return {
        valid: false,
        reason: `The record's entry chain is broken at position ${position} (entry ${entryId}): ${reason}. The stored log is no longer the log as it was written.`,
        record: summary,
      };
    }
    if (view.digest !== digest) {
      return { valid: false, reason: 'The record has changed since this copy was made: its digest is no longer the record’s.', record: summary };
    }
    const bad = view.signatures.filter((s) => !s.valid);
    if (bad.length) {
      return {
        valid: false,
        reason: `${bad.map((s) => `The "${s.meaningText}" signature of ${s.printedName}`).join(' and ')} does not verify against this record.`,
        record: summary,
      };
    }
    // The seal, the attachments' files and the addenda: what the digest alone cannot see.
    if (!view.integrity.valid) return { valid: false, reason: view.integrity.problems.join(' '), record: summary };
    const how = view.status === 'draft' ? 'It is a draft: nobody has signed it yet.' : view.status === 'partly-signed' ? 'It carries one of its two signatures.' : 'Both signatures verify.';
    return { valid: true, reason: `This copy matches the record as it is now. ${how}`, record: summary };
  }
}

/**
 * After the first signature the log grows only by addenda: an entry stored later but not marked
 * as one (inserted outside the application), or one marked as an addendum though stored before
 * any signature, is named.
 */
function addendumProblems(record: CanonicalRecord, rows: SignatureRow[]): string[] {
  const firstSignedAt = rows.length ? Math.min(...rows.map((r) => Date.parse(r.signedAt))) : undefined;
  const problems: string[] = [];
  record.entries.forEach((e, i) => {
    const stored = Date.parse(e.recordedAt);
    if (firstSignedAt !== undefined && stored > firstSignedAt && !e.addendum) {
      problems.push(`Entry ${i + 1} (${e.id}) was stored after the record was signed but is not marked as an addendum.`);
    } else if (e.addendum && (firstSignedAt === undefined || stored < firstSignedAt)) {
      problems.push(`Entry ${i + 1} (${e.id}) is marked as an addendum but was stored before the record was signed.`);
    }
  });
  return problems;
}
