import { Inject, Injectable, Logger, type OnModuleInit } from '@nestjs/common';
import type { EntryChainBreak, EntryChainStatus } from '@steadyhand/shared';
import { CodesRepository } from './codes.repository.js';
import { verifyEntryChain } from './entry-chain.js';

export interface ChainCheckSummary {
  codes: number;
  entries: number;
  /** Codes whose chain does not verify, with where it breaks. */
  broken: { codeId: string; brokenAt: EntryChainBreak }[];
}

/**
 * At start, links the entries a database holds without a link (stored before the chain existed),
 * before the server takes any tap, so every new entry chains after a complete log. Also checks
 * chains: one code's, or every code's (the backup check runs it on a copy of the database).
 */
@Injectable()
export class EntryChainService implements OnModuleInit {
  private readonly logger = new Logger(EntryChainService.name);

  constructor(@Inject(CodesRepository) private readonly repo: CodesRepository) {}

  onModuleInit(): void {
    const { added, codes, failed } = this.repo.backfillLinks();
    if (added) this.logger.log(`Entry chain: added ${added} links for entries stored without one, in ${codes} codes`);
    // Such a code's chain stays short and its record says where; the server still starts.
    for (const f of failed) this.logger.error(`Entry chain: could not link the entries of code ${f.codeId}: ${f.error}`);
  }

  verifyCode(codeId: string): EntryChainStatus & { entries: number } {
    const entries = this.repo.entriesOf(codeId);
    return { ...verifyEntryChain(entries, this.repo.linksOf(codeId)), entries: entries.length };
  }

  /** Every code's chain. `pause` runs between codes, so a long check inside the server leaves room for taps. */
  async verifyAll(pause: () => Promise<void> = () => Promise.resolve()): Promise<ChainCheckSummary> {
    const summary: ChainCheckSummary = { codes: 0, entries: 0, broken: [] };
    for (const codeId of this.repo.allCodeIds()) {
      const status = this.verifyCode(codeId);
      summary.codes++;
      summary.entries += status.entries;
      if (!status.valid) summary.broken.push({ codeId, brokenAt: status.brokenAt });
      await pause();
    }
    return summary;
  }
}
