import { BadRequestException, Body, Controller, Get, Header, HttpCode, Inject, Param, Patch, Post, Res, StreamableFile, UploadedFile, UseInterceptors } from '@nestjs/common';
import { FileInterceptor } from '@nestjs/platform-express';
import {
  newEntrySchema,
  reviewDetailsSchema,
  signRecordSchema,
  verifyRecordSchema,
  WRITER_ROLES,
  type NewEntry,
  type RecordListItem,
  type RecordPublicKeys,
  type RecordView,
  type RecordSignature,
  type RecordStatus,
  type ReviewDetailsRequest,
  type SignRecordRequest,
  type StoredEntry,
  type UtsteinAddendum,
  type UtsteinDetails,
  type VerifyRecordResult,
} from '@steadyhand/shared';
import type { Response } from 'express';
import { memoryStorage } from 'multer';
import { Attempt, CurrentUser, Roles } from '../auth/auth.decorators.js';
import type { PasswordAttempt } from '../auth/login-throttle.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import type { RecordCode } from './record-canonical.js';
import { RecordsService } from './records.service.js';

const [RECORDER, LEADER] = WRITER_ROLES as ['recorder', 'leader'];
/** A printed record with hundreds of entries and a few pages is well under this. */
const MAX_VERIFY_BYTES = 20 * 1024 * 1024;

@Controller()
export class RecordsController {
  constructor(@Inject(RecordsService) private readonly records: RecordsService) {}

  /** Reviewers and admins change the registry details (`utstein`) only: checked in the service. */
  @Roles(RECORDER, LEADER, 'reviewer', 'admin')
  @Patch('codes/:id/review')
  review(
    @CurrentUser() user: SessionUser,
    @Param('id') id: string,
    @Body(new ZodValidationPipe(reviewDetailsSchema)) body: ReviewDetailsRequest,
  ): { code: RecordCode; utstein: UtsteinDetails; utsteinAddenda: UtsteinAddendum[] } {
    return this.records.updateReview(user, id, body);
  }

  /** Who may sign with which meaning is checked in the service (recorder: recorded-by; leader: reviewed-confirmed). */
  @Roles(RECORDER, LEADER)
  @Post('codes/:id/signatures')
  @HttpCode(201)
  sign(
    @CurrentUser() user: SessionUser,
    @Param('id') id: string,
    @Body(new ZodValidationPipe(signRecordSchema)) body: SignRecordRequest,
    @Attempt() attempt: PasswordAttempt,
  ): Promise<{ signature: RecordSignature; status: RecordStatus }> {
    return this.records.sign(user, id, body, attempt);
  }

  @Roles(RECORDER, LEADER)
  @Post('codes/:id/addenda')
  @HttpCode(201)
  addendum(
    @CurrentUser() user: SessionUser,
    @Param('id') id: string,
    @Body(new ZodValidationPipe(newEntrySchema)) entry: NewEntry,
    @Res({ passthrough: true }) res: Response,
  ): { entry: StoredEntry } {
    const result = this.records.addAddendum(user, id, entry);
    if (result.duplicate) res.status(200);
    return { entry: result.entry };
  }

  @Roles('any')
  @Get('records')
  list(): { records: RecordListItem[] } {
    return { records: this.records.list() };
  }

  @Roles('any')
  @Get('codes/:id/record')
  record(@Param('id') id: string): Promise<RecordView> {
    return this.records.view(id);
  }

  @Roles('any')
  @Get('codes/:id/record.pdf')
  @Header('Content-Type', 'application/pdf')
  @Header('Cache-Control', 'no-store')
  async pdf(@CurrentUser() user: SessionUser, @Param('id') id: string, @Res({ passthrough: true }) res: Response): Promise<StreamableFile> {
    const { buffer, filename } = await this.records.pdf(user, id);
    res.setHeader('Content-Disposition', `inline; filename="${filename}"`);
    return new StreamableFile(buffer);
  }

  @Roles('any')
  @Get('records/public-key')
  @Header('Content-Type', 'application/x-pem-file')
  publicKey(): string {
    return this.records.publicKeyPem();
  }

  /** Every key the server has signed records with, oldest first, with the period each signed in. */
  @Roles('any')
  @Get('records/public-keys')
  publicKeys(): RecordPublicKeys {
    return this.records.publicKeys();
  }

  /** A PDF as multipart `file`, or JSON `{ digest, recordId? }`. */
  @Roles('any')
  @Post('records/verify')
  @HttpCode(200)
  @UseInterceptors(FileInterceptor('file', { storage: memoryStorage(), limits: { fileSize: MAX_VERIFY_BYTES, files: 1 } }))
  verify(@UploadedFile() file: Express.Multer.File | undefined, @Body() body: unknown): Promise<VerifyRecordResult> {
    if (file) return this.records.verifyPdf(file.buffer);
    if (body && typeof body === 'object' && Object.keys(body).length === 0) throw new BadRequestException('Send a PDF as the multipart field "file", or JSON { "digest" }');
    return this.records.verifyDigest(new ZodValidationPipe(verifyRecordSchema).transform(body));
  }
}
