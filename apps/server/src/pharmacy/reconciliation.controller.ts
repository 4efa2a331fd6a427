import { Body, Controller, Get, Header, HttpCode, Inject, Param, Post, Put, Query, Res, StreamableFile } from '@nestjs/common';
import {
  cartRestockQuerySchema,
  reconciliationAddendumSchema,
  saveReconciliationSchema,
  signReconciliationSchema,
  type CartRestock,
  type CartRestockQuery,
  type ReconciliationView,
  type SignReconciliationRequest,
  type WorklistItem,
} from '@steadyhand/shared';
import type { Response } from 'express';
import type { z } from 'zod';
import { Attempt, CurrentUser, Roles } from '../auth/auth.decorators.js';
import type { PasswordAttempt } from '../auth/login-throttle.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { CartRestockService } from './cart-restock.service.js';
import { ReconciliationService } from './reconciliation.service.js';

const attachment = (filename: string) => `attachment; filename="${filename}"`;

@Controller()
export class ReconciliationController {
  constructor(
    @Inject(ReconciliationService) private readonly reconciliation: ReconciliationService,
    @Inject(CartRestockService) private readonly carts: CartRestockService,
  ) {}

  @Roles('pharmacist')
  @Get('pharmacy/worklist')
  worklist(): { codes: WorklistItem[] } {
    return { codes: this.reconciliation.worklist() };
  }

  /** Recorders and leaders read the outcome of codes they took part in (checked in the service). */
  @Roles('pharmacist', 'recorder', 'leader')
  @Get('codes/:id/reconciliation')
  read(@CurrentUser() user: SessionUser, @Param('id') id: string): ReconciliationView {
    return this.reconciliation.read(user, id);
  }

  @Roles('pharmacist')
  @Put('codes/:id/reconciliation')
  save(
    @CurrentUser() user: SessionUser,
    @Param('id') id: string,
    @Body(new ZodValidationPipe(saveReconciliationSchema)) body: z.output<typeof saveReconciliationSchema>,
  ): ReconciliationView {
    return this.reconciliation.save(user, id, body);
  }

  @Roles('pharmacist')
  @Post('codes/:id/reconciliation/sign')
  @HttpCode(200)
  sign(
    @CurrentUser() user: SessionUser,
    @Param('id') id: string,
    @Body(new ZodValidationPipe(signReconciliationSchema)) body: SignReconciliationRequest,
    @Attempt() attempt: PasswordAttempt,
  ): Promise<ReconciliationView> {
    return this.reconciliation.sign(user, id, body.password, attempt);
  }

  @Roles('pharmacist')
  @Post('codes/:id/reconciliation/addenda')
  @HttpCode(201)
  addendum(
    @CurrentUser() user: SessionUser,
    @Param('id') id: string,
    @Body(new ZodValidationPipe(reconciliationAddendumSchema)) body: z.output<typeof reconciliationAddendumSchema>,
  ): ReconciliationView {
    return this.reconciliation.addAddendum(user, id, body);
  }

  @Roles('pharmacist')
  @Get('codes/:id/reconciliation/restock.csv')
  @Header('content-type', 'text/csv; charset=utf-8')
  restockCsv(@CurrentUser() user: SessionUser, @Param('id') id: string, @Res({ passthrough: true }) res: Response): string {
    const { filename, body } = this.reconciliation.restockCsv(user, id);
    res.setHeader('content-disposition', attachment(filename));
    return body;
  }

  @Roles('pharmacist')
  @Get('codes/:id/reconciliation/restock.pdf')
  async restockPdf(@CurrentUser() user: SessionUser, @Param('id') id: string, @Res({ passthrough: true }) res: Response): Promise<StreamableFile> {
    const { filename, body } = await this.reconciliation.restockPdf(user, id);
    res.setHeader('content-disposition', `inline; filename="${filename}"`);
    return new StreamableFile(body, { type: 'application/pdf', length: body.length });
  }

  /** One list for a unit's cart over every code since a date (signed-off reconciliations summed). */
  @Roles('pharmacist')
  @Get('pharmacy/carts/:unitId/restock')
  cartRestock(@Param('unitId') unitId: string, @Query(new ZodValidationPipe(cartRestockQuerySchema)) query: CartRestockQuery): CartRestock {
    return this.carts.restock(unitId, query.since);
  }

  @Roles('pharmacist')
  @Get('pharmacy/carts/:unitId/restock.csv')
  @Header('content-type', 'text/csv; charset=utf-8')
  cartRestockCsv(
    @CurrentUser() user: SessionUser,
    @Param('unitId') unitId: string,
    @Query(new ZodValidationPipe(cartRestockQuerySchema)) query: CartRestockQuery,
    @Res({ passthrough: true }) res: Response,
  ): string {
    const { filename, body } = this.carts.csv(user, unitId, query.since);
    res.setHeader('content-disposition', attachment(filename));
    return body;
  }

  @Roles('pharmacist')
  @Get('pharmacy/carts/:unitId/restock.pdf')
  async cartRestockPdf(
    @CurrentUser() user: SessionUser,
    @Param('unitId') unitId: string,
    @Query(new ZodValidationPipe(cartRestockQuerySchema)) query: CartRestockQuery,
    @Res({ passthrough: true }) res: Response,
  ): Promise<StreamableFile> {
    const { filename, body } = await this.carts.pdf(user, unitId, query.since);
    res.setHeader('content-disposition', `inline; filename="${filename}"`);
    return new StreamableFile(body, { type: 'application/pdf', length: body.length });
  }
}
