import {
  BadRequestException,
  HttpException,
  Inject,
  Injectable,
  PayloadTooLargeException,
  type CallHandler,
  type ExecutionContext,
  type NestInterceptor,
} from '@nestjs/common';
import type { Request, RequestHandler, Response } from 'express';
import multer from 'multer';
import type { Observable } from 'rxjs';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';

export const ATTACHMENT_FIELD = 'file';

/**
 * Reads one multipart file into memory, capped at ATTACHMENT_MAX_MB. It runs after the guard, so
 * a caller without the role is refused before any upload is read. Multer's errors become 4xx
 * answers that say what to do.
 */
@Injectable()
export class AttachmentUploadInterceptor implements NestInterceptor {
  private readonly parse: RequestHandler;
  private readonly limitText: string;

  constructor(@Inject(APP_CONFIG) config: AppConfig) {
    this.limitText = `${Number((config.attachmentMaxBytes / 1024 / 1024).toFixed(2))} MB`;
    this.parse = multer({
      storage: multer.memoryStorage(),
      // Browsers send UTF-8 file names; multer's default would read them as Latin-1.
      defParamCharset: 'utf8',
      limits: { fileSize: config.attachmentMaxBytes, files: 1, fields: 10, parts: 11, fieldSize: 64 * 1024 },
    }).single(ATTACHMENT_FIELD);
  }

  async intercept(context: ExecutionContext, next: CallHandler): Promise<Observable<unknown>> {
    const http = context.switchToHttp();
    const req = http.getRequest<Request>();
    const res = http.getResponse<Response>();
    await new Promise<void>((resolve, reject) => {
      void this.parse(req, res, (err?: unknown) => (err ? reject(this.toHttpError(err)) : resolve()));
    });
    return next.handle();
  }

  private toHttpError(err: unknown): Error {
    if (err instanceof HttpException) return err;
    if (err instanceof multer.MulterError) {
      // multer 2 names the file; its type definitions do not say so yet.
      const filename = (err as multer.MulterError & { filename?: string }).filename;
      const name = filename ? `${filename} is` : 'The file is';
      switch (err.code) {
        case 'LIMIT_FILE_SIZE':
          return new PayloadTooLargeException({
            statusCode: 413,
            error: 'Payload Too Large',
            message: `${name} larger than the ${this.limitText} limit for attachments (ATTACHMENT_MAX_MB)`,
          });
        case 'LIMIT_UNEXPECTED_FILE':
        case 'LIMIT_FILE_COUNT':
          return badRequest(`Send one file, in the multipart field "${ATTACHMENT_FIELD}" (got a file in "${err.field ?? '?'}")`);
        default:
          return badRequest(`The upload was refused: ${err.message}`);
      }
    }
    // busboy's complaints about a malformed body ("Unexpected end of form", no boundary...)
    return badRequest(`The upload is not a readable multipart/form-data body: ${err instanceof Error ? err.message : String(err)}`);
  }
}

const badRequest = (message: string) => new BadRequestException({ statusCode: 400, error: 'Bad Request', message });
