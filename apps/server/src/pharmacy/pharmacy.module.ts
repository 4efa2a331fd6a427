import { Module } from '@nestjs/common';
import { AuthModule } from '../auth/auth.module.js';
import { CodesModule } from '../codes/codes.module.js';
import { UsersModule } from '../users/users.module.js';
import { CartRestockService } from './cart-restock.service.js';
import { PharmacyRepository } from './pharmacy.repository.js';
import { ReconciliationController } from './reconciliation.controller.js';
import { ReconciliationService } from './reconciliation.service.js';
import { TraysController } from './trays.controller.js';
import { TraysService } from './trays.service.js';

/** Tray templates, the pharmacist's worklist and drug reconciliation, restock lists. */
@Module({
  imports: [AuthModule, CodesModule, UsersModule],
  controllers: [TraysController, ReconciliationController],
  providers: [PharmacyRepository, TraysService, ReconciliationService, CartRestockService],
})
export class PharmacyModule {}
