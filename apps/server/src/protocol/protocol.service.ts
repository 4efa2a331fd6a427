import { Inject, Injectable } from '@nestjs/common';
import { DEFAULT_PROTOCOL, protocolSettingsSchema, type ProtocolSettings } from '@steadyhand/shared';
import { eq } from 'drizzle-orm';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { settings } from '../db/schema/index.js';

const PROTOCOL_KEY = 'protocol';

/** The local protocol in force: the admin's saved settings, or the published defaults. */
@Injectable()
export class ProtocolService {
  constructor(@Inject(DB) private readonly db: Db) {}

  current(): ProtocolSettings {
    const row = this.db.select().from(settings).where(eq(settings.key, PROTOCOL_KEY)).get();
    if (!row) return DEFAULT_PROTOCOL;
    const parsed = protocolSettingsSchema.safeParse(row.value);
    return parsed.success ? parsed.data : DEFAULT_PROTOCOL;
  }
}
