import { Inject, Injectable, Logger, type OnModuleInit } from '@nestjs/common';
import type { EntryChainStatus } from '@steadyhand/shared';
import { CodesRepository } from './codes.repository.js';
import { verifyEntryChain } from './entry-chain.js';
import type { ChainCheckSummary } from './log-reader.js';
import { SealKey } from './record-seal.js';

/**
 * On the first start with record seals (the seal key was made just now), links the entries a
 * database holds without a link (stored before the chain existed) and seals every record as it
 * is found, before the server takes any tap. On any later start nothing is linked or sealed
 * again: an entry without a link, or a record without its seal, was changed outside the
 * application, and its record says so instead of being silently re-linked. Also checks chains:
 * one code's, or every code's (the backup check runs it on a copy of the database).
 */
@Injectable()
export class EntryChainService implements OnModuleInit {
  private readonly logger = new Logger(EntryChainService.name);

  constructor(
    @Inject(CodesRepository) private readonly repo: CodesRepository,
    @Inject(SealKey) private readonly sealKey: SealKey,
  ) {}

  onModuleInit(): void {
    if (!this.sealKey.createdNow) return;
    const { added, codes, failed } = this.repo.backfillLinks();
    if (added) this.logger.log(`Entry chain: added ${added} links for entries stored without one, in ${codes} codes`);
    // Such a code's chain stays short and its record says where; the server still starts.
    for (const f of failed) this.logger.error(`Entry chain: could not link the entries of code ${f.codeId}: ${f.error}`);
    const sealed = this.repo.sealAsFound();
    if (sealed) this.logger.log(`Record seals: sealed ${sealed} records as found (first start with seals)`);
  }

  verifyCode(codeId: string): EntryChainStatus & { entries: number } {
    const entries = this.repo.entriesOf(codeId);
    return { ...verifyEntryChain(entries, this.repo.linksOf(codeId)), entries: entries.length };
  }

  /** Every code's chain. `pause` runs between codes, so a long check inside the server leaves room for taps. */
  verifyAll(pause?: () => Promise<void>): Promise<ChainCheckSummary> {
    return this.repo.logReader().verifyAll(pause);
  }
}
