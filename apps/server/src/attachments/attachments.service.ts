import { createHash, randomUUID } from 'node:crypto';
import {
  BadRequestException,
  ConflictException,
  Inject,
  Injectable,
  Logger,
  NotFoundException,
  StreamableFile,
  UnsupportedMediaTypeException,
} from '@nestjs/common';
import { AuditService } from '../audit/audit.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { CodesService } from '../codes/codes.service.js';
import { RecordSealService } from '../codes/record-seal.service.js';
import { sha256Hex } from '../common/canonical-json.js';
import { AttachmentRefused, ATTACHMENT_TYPES, cleanFilename, contentDisposition, detectAttachmentType, isAttachmentMediaType } from './attachment-files.js';
import { AttachmentStore } from './attachment-store.js';
import { AttachmentsRepository, type Attachment } from './attachments.repository.js';
import { ATTACHMENT_FIELD } from './upload.interceptor.js';

@Injectable()
export class AttachmentsService {
  private readonly logger = new Logger(AttachmentsService.name);

  constructor(
    @Inject(AttachmentsRepository) private readonly repo: AttachmentsRepository,
    @Inject(AttachmentStore) private readonly store: AttachmentStore,
    @Inject(CodesService) private readonly codes: CodesService,
    @Inject(RecordSealService) private readonly seals: RecordSealService,
    @Inject(AuditService) private readonly audit: AuditService,
  ) {}

  /**
   * Checks the file by its bytes, keeps it on disk under its digest and lists it on the code.
   * The same bytes sent again to the same code (a retry) answer with the stored attachment.
   */
  async add(user: SessionUser, codeId: string, file: Express.Multer.File | undefined): Promise<{ attachment: Attachment; created: boolean }> {
    this.codes.get(codeId);
    if (!file) {
      throw new BadRequestException({ statusCode: 400, error: 'Bad Request', message: `Send the file as multipart/form-data in the field "${ATTACHMENT_FIELD}"` });
    }
    if (file.size === 0) throw new BadRequestException({ statusCode: 400, error: 'Bad Request', message: 'The file is empty' });
    let filename = cleanFilename(file.originalname);
    let mediaType: string;
    try {
      const detected = await detectAttachmentType(file.buffer, filename);
      mediaType = detected.mediaType;
      filename ||= `attachment.${detected.extension}`;
    } catch (err) {
      if (!(err instanceof AttachmentRefused)) throw err;
      const body = { error: err.reason === 'unsupported' ? 'Unsupported Media Type' : 'Bad Request', message: err.message };
      throw err.reason === 'unsupported'
        ? new UnsupportedMediaTypeException({ statusCode: 415, ...body })
        : new BadRequestException({ statusCode: 400, ...body });
    }
    const sha256 = createHash('sha256').update(file.buffer).digest('hex');
    await this.store.put(sha256, file.buffer);
    const result = this.seals.sealedWrite(codeId, 'attachments', () => this.repo.insertUnlessPresent({
      id: randomUUID(),
      codeId,
      sha256,
      filename,
      mediaType,
      sizeBytes: file.size,
      uploadedBy: user.id,
      uploadedAt: new Date().toISOString(),
    }));
    if (result.created) {
      const { id, filename: storedName, sizeBytes } = result.attachment;
      this.audit.record({
        action: 'attachment.added',
        userId: user.id,
        username: user.username,
        codeId,
        detail: { attachmentId: id, filename: storedName, mediaType, sizeBytes, sha256 },
      });
    }
    return result;
  }

  list(codeId: string): Attachment[] {
    this.codes.get(codeId);
    return this.repo.listByCode(codeId);
  }

  /**
   * The stored bytes with their type: images shown in the page, PDFs downloaded. Hashed again
   * before they are served: a file changed on disk is refused (409), never passed off as the
   * one the record lists.
   */
  async content(id: string): Promise<StreamableFile> {
    const attachment = this.repo.find(id);
    if (!attachment) throw new NotFoundException(`No attachment with id ${id}`);
    const bytes = await this.store.readAll(attachment.sha256);
    if (bytes === undefined) {
      this.logger.error(`The file of attachment ${id} (${attachment.sha256}) is missing from ${this.store.dir}`);
      throw new NotFoundException(`The file of attachment ${id} is missing from the store`);
    }
    if (sha256Hex(bytes) !== attachment.sha256) {
      this.logger.error(`The file of attachment ${id} no longer matches its SHA-256 ${attachment.sha256}`);
      throw new ConflictException({
        statusCode: 409,
        error: 'attachment-changed',
        message: `The file of ${attachment.filename} no longer matches the SHA-256 the record lists for it: it was changed on the server's disk. It is not served.`,
      });
    }
    const inline = isAttachmentMediaType(attachment.mediaType) && ATTACHMENT_TYPES[attachment.mediaType].inline;
    return new StreamableFile(bytes, {
      type: attachment.mediaType,
      length: bytes.length,
      disposition: contentDisposition(inline ? 'inline' : 'attachment', attachment.filename),
    });
  }

  /** Each attachment of a code whose file is missing or no longer has its listed SHA-256, in words. */
  async fileProblems(codeId: string): Promise<string[]> {
    const problems: string[] = [];
    for (const a of this.repo.listByCode(codeId)) {
      const bytes = await this.store.readAll(a.sha256);
      if (bytes === undefined) problems.push(`The file of attachment ${a.filename} (${a.id}) is missing from the server's disk.`);
      else if (sha256Hex(bytes) !== a.sha256) problems.push(`The file of attachment ${a.filename} (${a.id}) no longer matches its SHA-256: it was changed on the server's disk.`);
    }
    return problems;
  }
}
