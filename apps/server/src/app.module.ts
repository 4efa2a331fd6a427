import { Module, type DynamicModule } from '@nestjs/common';
import { AdminModule } from './admin/admin.module.js';
import { AttachmentsModule } from './attachments/attachments.module.js';
import { AuditModule } from './audit/audit.module.js';
import { AuthModule } from './auth/auth.module.js';
import { BackupsModule } from './backups/backups.module.js';
import { CodesModule } from './codes/codes.module.js';
import { ConfigModule } from './config/config.module.js';
import type { AppConfig } from './config/config.js';
import { DatabaseModule } from './db/database.module.js';
import type { DatabaseHandle } from './db/database.js';
import { DemoModule } from './demo/demo.module.js';
import { HealthModule } from './health/health.module.js';
import { MailModule } from './mail/mail.module.js';
import { MetricsModule } from './metrics/metrics.module.js';
import { PharmacyModule } from './pharmacy/pharmacy.module.js';
import { ProtocolModule } from './protocol/protocol.module.js';
import { QualityModule } from './quality/quality.module.js';
import { RecordsModule } from './records/records.module.js';
import { UsersModule } from './users/users.module.js';

@Module({})
export class AppModule {
  static forRoot(config: AppConfig, database: DatabaseHandle): DynamicModule {
    return {
      module: AppModule,
      imports: [
        ConfigModule.forConfig(config),
        DatabaseModule.forHandle(database),
        MetricsModule,
        AuditModule,
        MailModule,
        UsersModule,
        AuthModule,
        AdminModule,
        HealthModule,
        DemoModule,
        ProtocolModule,
        CodesModule,
        AttachmentsModule,
        RecordsModule,
        QualityModule,
        PharmacyModule,
        BackupsModule,
      ],
    };
  }
}
