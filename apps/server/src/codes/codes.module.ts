import { Module } from '@nestjs/common';
import { AuthModule } from '../auth/auth.module.js';
import { ProtocolModule } from '../protocol/protocol.module.js';
import { UsersModule } from '../users/users.module.js';
import { CodesController } from './codes.controller.js';
import { CodesRepository } from './codes.repository.js';
import { CodesService } from './codes.service.js';
import { EntriesService } from './entries.service.js';
import { EntryChainService } from './entry-chain.service.js';
import { EntryEvents } from './entry-events.js';
import { LiveGateway } from './live.gateway.js';
import { SealKey } from './record-seal.js';
import { RecordSealService } from './record-seal.service.js';

@Module({
  imports: [AuthModule, UsersModule, ProtocolModule],
  controllers: [CodesController],
  providers: [CodesRepository, CodesService, EntriesService, EntryChainService, EntryEvents, LiveGateway, SealKey, RecordSealService],
  exports: [CodesService, EntriesService, EntryEvents, LiveGateway, RecordSealService],
})
export class CodesModule {}
