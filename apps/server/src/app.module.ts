import { Module, type DynamicModule } from '@nestjs/common';
import { AuditModule } from './audit/audit.module.js';
import { AuthModule } from './auth/auth.module.js';
import { CodesModule } from './codes/codes.module.js';
import { ConfigModule } from './config/config.module.js';
import type { AppConfig } from './config/config.js';
import { DatabaseModule } from './db/database.module.js';
import type { DatabaseHandle } from './db/database.js';
import { DemoModule } from './demo/demo.module.js';
import { HealthModule } from './health/health.module.js';
import { ProtocolModule } from './protocol/protocol.module.js';
import { UsersModule } from './users/users.module.js';

@Module({})
export class AppModule {
  static forRoot(config: AppConfig, database: DatabaseHandle): DynamicModule {
    return {
      module: AppModule,
      imports: [
        ConfigModule.forConfig(config),
        DatabaseModule.forHandle(database),
        AuditModule,
        UsersModule,
        AuthModule,
        HealthModule,
        DemoModule,
        ProtocolModule,
        CodesModule,
      ],
    };
  }
}
