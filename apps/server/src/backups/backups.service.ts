import { Inject, Injectable, Logger, Optional, type OnApplicationBootstrap, type OnApplicationShutdown } from '@nestjs/common';
import type { BackupList } from '@steadyhand/shared';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';
import { DATABASE } from '../db/database.module.js';
import type { DatabaseHandle } from '../db/database.js';
import { MetricsService } from '../metrics/metrics.service.js';
import { describeCheck, listCopies, runBackup, type BackupResult } from './backup-copy.js';

/** Pages copied per step inside the server (4 MiB at SQLite's default page size); taps run between steps. */
const PAGES_PER_STEP = 1024;

/**
 * Copies the database every BACKUP_INTERVAL_MINUTES while the server runs, checks each copy and
 * logs the result; lists the copies for the admin page.
 */
@Injectable()
export class BackupsService implements OnApplicationBootstrap, OnApplicationShutdown {
  private readonly logger = new Logger(BackupsService.name);
  private timer: ReturnType<typeof setInterval> | null = null;
  private running: Promise<BackupResult> | null = null;

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(DATABASE) private readonly database: DatabaseHandle,
    @Optional() @Inject(MetricsService) private readonly metrics?: MetricsService,
  ) {}

  onApplicationBootstrap(): void {
    const minutes = this.config.backup.intervalMinutes;
    if (minutes <= 0) return;
    this.timer = setInterval(() => {
      this.backupNow().catch(() => undefined); // logged and counted in backupNow
    }, minutes * 60_000);
    this.timer.unref();
  }

  onApplicationShutdown(): void {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
  }

  /** One copy now; a copy already running is awaited rather than started twice. */
  backupNow(): Promise<BackupResult> {
    this.running ??= this.run().finally(() => {
      this.running = null;
    });
    return this.running;
  }

  private async run(): Promise<BackupResult> {
    const started = Date.now();
    try {
      const result = await runBackup({
        source: this.database.sqlite,
        dataDir: this.config.dataDir,
        backupDir: this.config.backup.dir,
        keep: this.config.backup.keep,
        pagesPerStep: PAGES_PER_STEP,
      });
      this.metrics?.backups.inc({ result: result.check.ok ? 'ok' : 'failed' });
      const line = `Backup ${result.file} (${result.sizeBytes} bytes, ${Date.now() - started} ms): ${describeCheck(result.check)}`;
      if (result.check.ok) this.logger.log(line);
      else this.logger.error(`${line}. This copy would not restore cleanly: look at the database now.`);
      return result;
    } catch (err) {
      this.metrics?.backups.inc({ result: 'error' });
      this.logger.error(`Backup into ${this.config.backup.dir} failed: ${err instanceof Error ? err.message : String(err)}`);
      throw err;
    }
  }

  list(): BackupList {
    const { dir, intervalMinutes, keep } = this.config.backup;
    return { dir, intervalMinutes, keep, copies: listCopies(dir) };
  }
}
