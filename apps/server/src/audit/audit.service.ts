import { Inject, Injectable } from '@nestjs/common';
import { AuditRepository, type AuditRecord } from './audit.repository.js';

/** The audit trail: every privileged action becomes an append-only row. */
@Injectable()
export class AuditService {
  constructor(@Inject(AuditRepository) private readonly repo: AuditRepository) {}

  record(record: AuditRecord): void {
    this.repo.insert(record, new Date().toISOString());
  }
}
