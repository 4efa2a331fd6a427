import { Inject, Injectable, Logger, type OnApplicationBootstrap } from '@nestjs/common';
import { CodesService } from '../codes/codes.service.js';
import { EntryEvents } from '../codes/entry-events.js';
import { computeCodeMetrics } from './quality-metrics.js';
import { QualityRepository } from './quality.repository.js';

/**
 * Keeps `code_metrics` in step with the log: an ended code's row is recomputed whenever an entry
 * lands on it (a correction or addendum after the end) or its details change (the registry details
 * too: the time-to-shock target reads witnessed and monitored); a code that reopens
 * loses its row. Listens to the codes module's events, so the tap path does not know about us.
 */
@Injectable()
export class QualityMetricsService implements OnApplicationBootstrap {
  private readonly logger = new Logger(QualityMetricsService.name);

  constructor(
    @Inject(EntryEvents) private readonly events: EntryEvents,
    @Inject(CodesService) private readonly codes: CodesService,
    @Inject(QualityRepository) private readonly repo: QualityRepository,
  ) {}

  onApplicationBootstrap(): void {
    // Taps on a running code change nothing here; a reopened code is announced as a codes change.
    // A code still running has no metrics yet; only corrections after the end change them.
    this.events.onAdded(({ codeId }, { codeStatus }) => {
      if (codeStatus === 'ended') this.refreshSafely(codeId, false);
    });
    this.events.onCodesChanged((codeId) => this.refreshSafely(codeId, true));
    // Codes that ended while this table was not kept (an older build, a restored file).
    const missing = this.repo.endedCodesWithoutMetrics();
    for (const id of missing) this.refreshSafely(id, false);
    if (missing.length) this.logger.log(`Computed quality metrics for ${missing.length} ended codes`);
  }

  /** Recomputes an ended code's row; `removeIfOpen`: a code not (or no longer) ended loses its row. */
  refresh(codeId: string, removeIfOpen = true): void {
    const code = this.codes.find(codeId);
    if (!code) return;
    if (code.status !== 'ended') {
      if (removeIfOpen) this.repo.deleteMetrics(codeId);
      return;
    }
    this.repo.upsertMetrics(computeCodeMetrics(code, this.codes.timelineOf(code), this.codes.utsteinOf(codeId)));
  }

  // The listener runs inside the entry's request after its commit: a failure here must never fail the tap.
  private refreshSafely(codeId: string, removeIfOpen: boolean): void {
    try {
      this.refresh(codeId, removeIfOpen);
    } catch (err) {
      this.logger.error(`Could not update quality metrics of code ${codeId}: ${(err as Error).message}`);
    }
  }
}
