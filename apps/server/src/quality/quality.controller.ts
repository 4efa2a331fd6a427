import { Body, Controller, Get, HttpCode, Inject, Param, Post, Put, Query, Res } from '@nestjs/common';
import {
  followUpListQuerySchema,
  followUpSchema,
  qualityFilterSchema,
  qualityListQuerySchema,
  qualityReviewSchema,
  qualitySignOffSchema,
  type FhirBundle,
  type FollowUp,
  type FollowUpListQuery,
  type FollowUpListResponse,
  type FollowUpRequest,
  type QualityCodeDetail,
  type QualityFilter,
  type QualityListQuery,
  type QualityListResponse,
  type QualityReview,
  type QualityReviewRequest,
  type QualitySignOffRequest,
  type QualityStats,
} from '@steadyhand/shared';
import type { Response } from 'express';
import { Attempt, CurrentUser, Roles } from '../auth/auth.decorators.js';
import type { PasswordAttempt } from '../auth/login-throttle.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { FollowUpService } from './follow-up.service.js';
import { QualityService } from './quality.service.js';

/** The quality reviewer's area: reviewers and admins only, every route. */
@Roles('reviewer', 'admin')
@Controller('quality')
export class QualityController {
  constructor(
    @Inject(QualityService) private readonly quality: QualityService,
    @Inject(FollowUpService) private readonly followUps: FollowUpService,
  ) {}

  @Roles('reviewer', 'admin')
  @Get('codes')
  list(@Query(new ZodValidationPipe(qualityListQuerySchema)) query: QualityListQuery): QualityListResponse {
    return this.quality.list(query);
  }

  @Roles('reviewer', 'admin')
  @Get('stats')
  stats(@Query(new ZodValidationPipe(qualityFilterSchema)) filter: QualityFilter): QualityStats {
    return this.quality.stats(filter);
  }

  @Roles('reviewer', 'admin')
  @Get('export/utstein.csv')
  utstein(
    @CurrentUser() user: SessionUser,
    @Query(new ZodValidationPipe(qualityFilterSchema)) filter: QualityFilter,
    @Res({ passthrough: true }) res: Response,
  ): string {
    res.setHeader('content-type', 'text/csv; charset=utf-8; header=present');
    res.setHeader('content-disposition', `attachment; filename="steadyhand-utstein-${new Date().toISOString().slice(0, 10)}.csv"`);
    return this.quality.utsteinCsv(user, filter);
  }

  @Roles('reviewer', 'admin')
  @Get('follow-up')
  followUpList(@Query(new ZodValidationPipe(followUpListQuerySchema)) query: FollowUpListQuery): FollowUpListResponse {
    return this.followUps.waiting(query);
  }

  @Roles('reviewer', 'admin')
  @Put('codes/:id/follow-up')
  saveFollowUp(
    @CurrentUser() user: SessionUser,
    @Param('id') id: string,
    @Body(new ZodValidationPipe(followUpSchema)) body: FollowUpRequest,
  ): { followUp: FollowUp } {
    return { followUp: this.followUps.save(user, id, body) };
  }

  @Roles('reviewer', 'admin')
  @Get('codes/:id')
  detail(@Param('id') id: string): QualityCodeDetail {
    return this.quality.detail(id);
  }

  @Roles('reviewer', 'admin')
  @Put('codes/:id/review')
  saveReview(
    @CurrentUser() user: SessionUser,
    @Param('id') id: string,
    @Body(new ZodValidationPipe(qualityReviewSchema)) body: QualityReviewRequest,
  ): { review: QualityReview } {
    return { review: this.quality.saveReview(user, id, body) };
  }

  @Roles('reviewer', 'admin')
  @Post('codes/:id/review/sign')
  @HttpCode(200)
  async signOff(
    @CurrentUser() user: SessionUser,
    @Param('id') id: string,
    @Body(new ZodValidationPipe(qualitySignOffSchema)) body: QualitySignOffRequest,
    @Attempt() attempt: PasswordAttempt,
  ): Promise<{ review: QualityReview }> {
    return { review: await this.quality.signOff(user, id, body.password, attempt) };
  }

  @Roles('reviewer', 'admin')
  @Get('codes/:id/fhir')
  fhir(@CurrentUser() user: SessionUser, @Param('id') id: string, @Res({ passthrough: true }) res: Response): FhirBundle {
    const bundle = this.quality.fhirBundle(user, id);
    res.setHeader('content-type', 'application/fhir+json; charset=utf-8');
    res.setHeader('content-disposition', `attachment; filename="steadyhand-code-${id}.fhir.json"`);
    return bundle;
  }
}
