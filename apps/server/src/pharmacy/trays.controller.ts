import { Body, Controller, Get, HttpCode, Inject, Param, Post, Put } from '@nestjs/common';
import {
  trayTemplateInputSchema,
  unitTrayInputSchema,
  type PharmacyUnit,
  type TrayTemplate,
  type UnitTrayInput,
} from '@steadyhand/shared';
import type { z } from 'zod';
import { CurrentUser, Roles } from '../auth/auth.decorators.js';
import type { SessionUser } from '../auth/session-user.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { TraysService } from './trays.service.js';

@Controller('pharmacy')
export class TraysController {
  constructor(@Inject(TraysService) private readonly trays: TraysService) {}

  @Roles('admin', 'pharmacist')
  @Get('trays')
  list(): { trays: TrayTemplate[]; units: PharmacyUnit[] } {
    return this.trays.list();
  }

  @Roles('admin')
  @Post('trays')
  @HttpCode(201)
  create(
    @CurrentUser() user: SessionUser,
    @Body(new ZodValidationPipe(trayTemplateInputSchema)) body: z.output<typeof trayTemplateInputSchema>,
  ): { tray: TrayTemplate } {
    return { tray: this.trays.create(user, body) };
  }

  @Roles('admin')
  @Put('trays/:trayId')
  update(
    @CurrentUser() user: SessionUser,
    @Param('trayId') trayId: string,
    @Body(new ZodValidationPipe(trayTemplateInputSchema)) body: z.output<typeof trayTemplateInputSchema>,
  ): { tray: TrayTemplate } {
    return { tray: this.trays.update(user, trayId, body) };
  }

  @Roles('admin')
  @Put('units/:unitId/tray')
  assign(
    @CurrentUser() user: SessionUser,
    @Param('unitId') unitId: string,
    @Body(new ZodValidationPipe(unitTrayInputSchema)) body: UnitTrayInput,
  ): { unit: PharmacyUnit } {
    return { unit: this.trays.assign(user, unitId, body) };
  }
}
