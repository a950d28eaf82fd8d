import {
  type CallHandler,
  type ExecutionContext,
  Injectable,
  type NestInterceptor,
  PayloadTooLargeException,
} from '@nestjs/common';
import { FileInterceptor } from '@nestjs/platform-express';
import { MAX_DOCUMENT_BYTES } from '@tareline/protocol';
import type { Observable } from 'rxjs';
import { tooLarge } from './documents.service.js';

/**
 * The upload interceptor for one data sheet in the form field `file`, held in memory (at most
 * 20 MB; multer stops reading past that). Multer's "too large" becomes the hub's 413 in words.
 */
@Injectable()
export class DocumentUploadInterceptor implements NestInterceptor {
  private readonly multer: NestInterceptor = new (FileInterceptor('file', {
    limits: { fileSize: MAX_DOCUMENT_BYTES, files: 1, fields: 5 },
  }))();

  async intercept(context: ExecutionContext, next: CallHandler): Promise<Observable<unknown>> {
    try {
      return await this.multer.intercept(context, next);
    } catch (err) {
      if (err instanceof PayloadTooLargeException) throw tooLarge();
      throw err;
    }
  }
}
