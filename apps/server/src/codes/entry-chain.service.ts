import { Inject, Injectable, Logger, type OnModuleInit } from '@nestjs/common';
import { CodesRepository } from './codes.repository.js';
import { SealKey } from './record-seal.js';

/**
 * On the first start with record seals (the seal key was made just now), links the entries a
 * database holds without a link (stored before the chain existed) and seals every record as it
 * is found, before the server takes any tap. On any later start nothing is linked or sealed
 * again: an entry without a link, or a record without its seal, was changed outside the
 * application, and its record says so instead of being silently re-linked.
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
}
