import { Inject, Injectable } from '@nestjs/common';
import { CodesRepository } from './codes.repository.js';
import { differingParts, SealKey } from './record-seal.js';

const short = (hash: string) => `${hash.slice(0, 16)}…`;

/** Checks a record against its seal and says, in words, each way it differs. */
@Injectable()
export class RecordSealService {
  constructor(
    @Inject(CodesRepository) private readonly repo: CodesRepository,
    @Inject(SealKey) private readonly key: SealKey,
  ) {}

  /** Runs a write that adds a signature or an attachment, moving that part of the seal in the same transaction. */
  sealedWrite<T>(codeId: string, part: 'signatures' | 'attachments' | 'detailAddenda', write: () => T): T {
    return this.repo.sealedWrite(codeId, part, write);
  }

  /** Each difference between the record as stored and its seal; empty when they agree. */
  problems(codeId: string): string[] {
    const seal = this.repo.sealOf(codeId);
    if (!seal) return ['The record has no seal: its seal was removed outside Steadyhand (every record is sealed from its start).'];
    if (!this.key.verifies(seal)) return ["The record's seal does not verify: it was changed outside Steadyhand."];
    const now = this.repo.sealState(codeId);
    const problems: string[] = [];
    for (const part of differingParts(seal, now)) {
      if (part === 'entries') {
        problems.push(
          `The entry log is not the one the server sealed: the seal holds ${seal.entries} entries ending in ${short(seal.head)}, the log has ${now.entries} ending in ${short(now.head)}. Entries were removed, added or rewritten outside Steadyhand.`,
        );
      } else if (part === 'signatures') {
        problems.push(`${now.signatures} signature${now.signatures === 1 ? ' is' : 's are'} stored, but the seal counts ${seal.signatures}: a signature was removed or added outside Steadyhand.`);
      } else if (part === 'attachments') {
        problems.push('The attachments listed are not the ones the server sealed: an attachment was removed, added or changed outside Steadyhand.');
      } else {
        problems.push('The changes to the registry details after signing are not the ones the server sealed: one was removed, added or rewritten outside Steadyhand.');
      }
    }
    return problems;
  }
}
