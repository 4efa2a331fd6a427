import { Inject, Injectable, Logger, type OnModuleInit } from '@nestjs/common';
import { CodesRepository } from './codes.repository.js';

/**
 * At start, links the entries a database holds without a link (stored before the chain existed),
 * before the server takes any tap, so every new entry chains after a complete log.
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
}
