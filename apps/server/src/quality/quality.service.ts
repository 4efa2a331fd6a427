import { randomUUID } from 'node:crypto';
import { ConflictException, Inject, Injectable } from '@nestjs/common';
import {
  aggregateQuality,
  buildFhirBundle,
  evaluateTargets,
  summarize,
  utsteinCsv,
  utsteinRow,
  type FhirBundle,
  type QualityCodeDetail,
  type QualityFilter,
  type QualityListQuery,
  type QualityListResponse,
  type QualityReview,
  type QualityReviewRequest,
  type QualityStats,
} from '@steadyhand/shared';
import { AuditService } from '../audit/audit.service.js';
import type { SessionUser } from '../auth/session-user.js';
import type { PasswordAttempt } from '../auth/login-throttle.service.js';
import { PasswordCheckService } from '../auth/password-check.service.js';
import { CodesService } from '../codes/codes.service.js';
import { followUpFromRow, FollowUpService } from './follow-up.service.js';
import { QualityRepository } from './quality.repository.js';

@Injectable()
export class QualityService {
  constructor(
    @Inject(QualityRepository) private readonly repo: QualityRepository,
    @Inject(CodesService) private readonly codes: CodesService,
    @Inject(PasswordCheckService) private readonly passwords: PasswordCheckService,
    @Inject(AuditService) private readonly audit: AuditService,
    @Inject(FollowUpService) private readonly followUps: FollowUpService,
  ) {}

  list(query: QualityListQuery): QualityListResponse {
    const { items, total } = this.repo.list(query);
    return { items, total, page: query.page, pageSize: query.pageSize, units: this.repo.units() };
  }

  stats(filter: QualityFilter): QualityStats {
    return aggregateQuality(this.repo.statsRows(filter));
  }

  detail(id: string): QualityCodeDetail {
    const code = this.codes.get(id);
    const summary = summarize(this.codes.timelineOf(code));
    const utstein = this.codes.utsteinOf(id);
    return {
      code: {
        id: code.id,
        status: code.status,
        category: code.category,
        location: code.location,
        unitId: code.unitId,
        unitName: this.repo.unitName(code.unitId),
        arrestAt: code.arrestAt,
        endedAt: code.endedAt,
        outcome: code.outcome,
      },
      summary,
      targets: evaluateTargets(summary, utstein),
      review: this.reviewOf(id),
      signatures: this.repo.signaturesOf(id).map((s) => ({ printedName: s.printedName, meaning: s.meaning, signedAt: s.signedAt })),
      utstein,
      followUp: this.followUps.of(id),
    };
  }

  private reviewOf(id: string): QualityReview {
    const row = this.repo.review(id);
    return {
      notes: row?.notes ?? null,
      debriefPoints: row?.debriefPoints ?? [],
      teamDebriefNotes: this.codes.reviewDetails(id)?.debriefNotes ?? null,
      reviewedBy: row?.reviewedBy ? { id: row.reviewedBy, displayName: row.reviewerName ?? '' } : null,
      reviewedAt: row?.reviewedAt ?? null,
      updatedAt: row?.updatedAt ?? null,
    };
  }

  private endedCode(id: string) {
    const code = this.codes.get(id);
    if (code.status !== 'ended') throw new ConflictException('The code has not ended: it is reviewed after it ends');
    return code;
  }

  /** Notes and debrief points; a signed-off review is closed (a later change would not be what was signed). */
  saveReview(user: SessionUser, id: string, body: QualityReviewRequest): QualityReview {
    this.endedCode(id);
    const before = this.reviewOf(id);
    if (before.reviewedAt) throw new ConflictException('This review is signed off and closed');
    const changes = {
      ...(body.notes !== undefined ? { notes: body.notes } : {}),
      ...(body.debriefPoints !== undefined ? { debriefPoints: body.debriefPoints } : {}),
      updatedAt: new Date().toISOString(),
    };
    this.repo.saveReview(id, changes);
    this.audit.record({
      action: 'quality.review-saved',
      userId: user.id,
      username: user.username,
      codeId: id,
      detail: {
        ...(body.notes !== undefined ? { notes: { from: before.notes, to: body.notes } } : {}),
        ...(body.debriefPoints !== undefined ? { debriefPoints: { from: before.debriefPoints, to: body.debriefPoints } } : {}),
      },
    });
    return this.reviewOf(id);
  }

  /** The reviewed-by sign-off, with the password typed again (as for the record's signatures). */
  async signOff(user: SessionUser, id: string, password: string, attempt: PasswordAttempt): Promise<QualityReview> {
    this.endedCode(id);
    if (this.reviewOf(id).reviewedAt) throw new ConflictException('This review is signed off already');
    await this.passwords.confirm(user, password, attempt, { failedAction: 'quality.sign-off-failed', codeId: id });
    // Checked again after the slow hash: another reviewer may have signed meanwhile.
    if (this.reviewOf(id).reviewedAt) throw new ConflictException('This review is signed off already');
    const now = new Date().toISOString();
    this.repo.saveReview(id, { reviewedBy: user.id, reviewedAt: now, updatedAt: now });
    this.audit.record({ action: 'quality.review-signed', userId: user.id, username: user.username, codeId: id, detail: { printedName: user.displayName, reviewedAt: now } });
    return this.reviewOf(id);
  }

  utsteinCsv(user: SessionUser, filter: QualityFilter): string {
    const ids = this.repo.codeIds(filter);
    const facility = this.repo.facility();
    const units = new Map(this.repo.units().map((u) => [u.id, u.name]));
    const followUps = this.repo.followUpsOf(ids);
    const rows = ids.flatMap((id) => {
      const code = this.codes.find(id);
      if (!code) return [];
      const summary = summarize(this.codes.timelineOf(code));
      const followUp = followUps.get(id);
      return [
        utsteinRow({
          code,
          summary,
          facility,
          unitName: code.unitId ? (units.get(code.unitId) ?? null) : null,
          utstein: this.codes.utsteinOf(id),
          followUp: followUp ? followUpFromRow(followUp) : null,
        }),
      ];
    });
    this.audit.record({ action: 'quality.export-utstein', userId: user.id, username: user.username, detail: { filter, codes: rows.length } });
    return utsteinCsv(rows);
  }

  fhirBundle(user: SessionUser, id: string): FhirBundle {
    const code = this.codes.get(id);
    const signatures = this.repo.signaturesOf(id);
    if (signatures.length === 0) throw new ConflictException('The record is not signed yet: the FHIR document is made from a signed record');
    const timeline = this.codes.timelineOf(code);
    const bundle = buildFhirBundle({
      code,
      timeline,
      summary: summarize(timeline),
      utstein: this.codes.utsteinOf(id),
      followUp: this.followUps.of(id),
      signatures,
      facility: this.repo.facility(),
      unitName: this.repo.unitName(code.unitId),
      generatedAt: new Date().toISOString(),
      newId: randomUUID,
    });
    this.audit.record({ action: 'quality.export-fhir', userId: user.id, username: user.username, codeId: id, detail: { bundleId: bundle.id, resources: bundle.entry.length } });
    return bundle;
  }
}
