import { randomUUID } from 'node:crypto';
import { Inject, Injectable, Logger } from '@nestjs/common';
import type { Role } from '@steadyhand/shared';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { settings, units } from '../db/schema/index.js';
import { CodesService } from '../codes/codes.service.js';
import { EntriesService } from '../codes/entries.service.js';
import { seedDemoTray } from '../pharmacy/demo-tray.js';
import { RecordsService } from '../records/records.service.js';
import { UsersService } from '../users/users.service.js';
import { FollowUpService } from '../quality/follow-up.service.js';
import { DEMO_CODES, type DemoCode } from './demo-codes.js';
import { DEMO_FACILITY, DEMO_PASSWORD, DEMO_PEOPLE, DEMO_UNITS } from './demo-data.js';
import type { PasswordAttempt } from '../auth/login-throttle.service.js';

/** The demo signs its past codes itself, from no address and no device. */
const DEMO_LOADER: PasswordAttempt = { ip: undefined, deviceId: undefined };

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
    @Inject(CodesService) private readonly codes: CodesService,
    @Inject(EntriesService) private readonly entries: EntriesService,
    @Inject(RecordsService) private readonly records: RecordsService,
    @Inject(FollowUpService) private readonly followUps: FollowUpService,
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
      tx.insert(settings)
        .values({ key: 'facility', value: { name: DEMO_FACILITY }, updatedAt: now })
        .onConflictDoNothing()
        .run();
      const unitIds: string[] = [];
      for (const name of DEMO_UNITS) {
        const id = randomUUID();
        if (
          tx.insert(units).values({ id, name, createdAt: now }).onConflictDoNothing().run()
            .changes === 1
        )
          unitIds.push(id);
      }
      seedDemoTray(tx, unitIds, now);
    });
    for (const person of DEMO_PEOPLE) {
      await this.users.create(
        { ...person, password: DEMO_PASSWORD },
        { userId: null, username: 'demo-loader' },
      );
    }
    const unitIds = new Map(
      this.db
        .select({ id: units.id, name: units.name })
        .from(units)
        .all()
        .map((u) => [u.name, u.id]),
    );
    for (const code of DEMO_CODES) await this.seedCode(code, unitIds);
    this.logger.log(
      `Loaded the demo hospital: ${DEMO_PEOPLE.length} people, ${DEMO_UNITS.length} units, ${DEMO_CODES.length} past codes`,
    );
    return true;
  }

  /** One past code through the same services a tablet and a signer use, so it is a real record. */
  private async seedCode(demo: DemoCode, unitIds: Map<string, string>): Promise<void> {
    const person = (username: string) => {
      const row = this.users.findByUsername(username);
      const user = row && this.users.sessionUser(row.id);
      if (!user) throw new Error(`The demo person ${username} is missing`);
      return user;
    };
    const recorder = person(demo.recordedBy);
    const day = new Date();
    day.setDate(day.getDate() - demo.daysAgo);
    day.setHours(...demo.clock, 0);
    const arrest = day.getTime();
    const { code } = this.codes.create(recorder, {
      ...demo.details,
      unitId: unitIds.get(demo.unit),
      arrestAt: new Date(arrest).toISOString(),
    });
    demo.steps.forEach(([seconds, fields], seq) => {
      const at = new Date(arrest + seconds * 1000).toISOString();
      this.entries.add(
        recorder,
        code.id,
        { ...fields, id: randomUUID(), at, deviceId: demo.deviceId, seq },
        at,
      );
    });
    if (demo.team.length > 0 || demo.debriefNotes) {
      this.records.updateReview(recorder, code.id, {
        team: demo.team,
        ...(demo.debriefNotes ? { debriefNotes: demo.debriefNotes } : {}),
      });
    }
    if (demo.utstein) {
      const { teamArrivedAt, padsOnAt, deathPronouncedAt, ...coded } = demo.utstein;
      const at = (seconds: number) => new Date(arrest + seconds * 1000).toISOString();
      this.records.updateReview(recorder, code.id, {
        utstein: {
          ...coded,
          ...(teamArrivedAt !== undefined ? { teamArrivedAt: at(teamArrivedAt) } : {}),
          ...(padsOnAt !== undefined ? { padsOnAt: at(padsOnAt) } : {}),
          ...(deathPronouncedAt !== undefined ? { deathPronouncedAt: at(deathPronouncedAt) } : {}),
        },
      });
    }
    if (demo.signedBy.recorder)
      await this.records.sign(person(demo.signedBy.recorder), code.id, {
        meaning: 'recorded-by',
        password: DEMO_PASSWORD,
      }, DEMO_LOADER);
    if (demo.signedBy.leader)
      await this.records.sign(person(demo.signedBy.leader), code.id, {
        meaning: 'reviewed-confirmed',
        password: DEMO_PASSWORD,
      }, DEMO_LOADER);
    if (demo.followUp) {
      const f = demo.followUp;
      const day = (n: number | undefined) => (n === undefined ? null : new Date(arrest + n * 86_400_000).toISOString().slice(0, 10));
      this.followUps.save(person('ewan.trelawny'), code.id, {
        survivalToDischarge: f.survivalToDischarge,
        survivalToDischargeDate: day(f.survivalDay),
        ...(f.status30Days ? { status30Days: f.status30Days, status30DaysDate: day(f.status30Day) } : {}),
        ...(f.neurologicalOutcome ? { neurologicalOutcome: f.neurologicalOutcome, neurologicalOutcomeDate: day(f.neurologicalOutcomeDay) } : {}),
      });
    }
  }
}
