import { randomUUID } from 'node:crypto';
import { Inject, Injectable, Logger } from '@nestjs/common';
import type { Role } from '@steadyhand/shared';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { settings, units } from '../db/schema/index.js';
import { seedDemoTray } from '../pharmacy/demo-tray.js';
import { UsersService } from '../users/users.service.js';
import { DEMO_FACILITY, DEMO_PASSWORD, DEMO_PEOPLE, DEMO_UNITS } from './demo-data.js';

export interface DemoInfo {
  enabled: boolean;
  password?: string;
  accounts?: { username: string; displayName: string; roles: Role[] }[];
}

@Injectable()
export class DemoService {
  private readonly logger = new Logger(DemoService.name);

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(DB) private readonly db: Db,
    @Inject(UsersService) private readonly users: UsersService,
  ) {}

  info(): DemoInfo {
    if (!this.config.demo) return { enabled: false };
    return { enabled: true, password: DEMO_PASSWORD, accounts: DEMO_PEOPLE };
  }

  /** Loads the demo hospital into a new database; does nothing when anyone exists already. */
  async seedIfEmpty(): Promise<boolean> {
    if (this.users.count() > 0) return false;
    const now = new Date().toISOString();
    this.db.transaction((tx) => {
      tx.insert(settings).values({ key: 'facility', value: { name: DEMO_FACILITY }, updatedAt: now }).onConflictDoNothing().run();
      const unitIds: string[] = [];
      for (const name of DEMO_UNITS) {
        const id = randomUUID();
        if (tx.insert(units).values({ id, name, createdAt: now }).onConflictDoNothing().run().changes === 1) unitIds.push(id);
      }
      seedDemoTray(tx, unitIds, now);
    });
    for (const person of DEMO_PEOPLE) {
      await this.users.create({ ...person, password: DEMO_PASSWORD }, { userId: null, username: 'demo-loader' });
    }
    this.logger.log(`Loaded the demo hospital: ${DEMO_PEOPLE.length} people, ${DEMO_UNITS.length} units`);
    return true;
  }
}
