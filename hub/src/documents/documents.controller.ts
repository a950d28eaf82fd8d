import {
  Body,
  Controller,
  Get,
  Inject,
  Param,
  Post,
  Query,
  StreamableFile,
  UploadedFile,
  UseInterceptors,
} from '@nestjs/common';
import {
  documentIdSchema,
  documentLinkQuerySchema,
  documentUploadSchema,
  materialIdSchema,
  type MaterialDocument,
} from '@tareline/protocol';
import type { z } from 'zod';
import { Public, Roles } from '../auth/access.decorator.js';
import type { AuthUser } from '../auth/auth-user.js';
import { CurrentUser } from '../auth/current-user.decorator.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { DocumentUploadInterceptor } from './document-upload.interceptor.js';
import { DocumentsService, type OpenDocument, type UploadedPdf } from './documents.service.js';

const materialId = new ZodValidationPipe(materialIdSchema, 'Not a material id');
const documentId = new ZodValidationPipe(documentIdSchema, 'Not a document id');

function pdf(doc: OpenDocument): StreamableFile {
  return new StreamableFile(doc.stream, {
    type: 'application/pdf',
    length: doc.sizeBytes,
    // Shown in the browser's own viewer; the name is for "save as".
    disposition: `inline; filename="${doc.fileName}"`,
  });
}

@Controller()
export class DocumentsController {
  constructor(@Inject(DocumentsService) private readonly documents: DocumentsService) {}

  @Post('materials/:id/documents')
  @Roles('lead', 'admin')
  @UseInterceptors(DocumentUploadInterceptor)
  upload(
    @Param('id', materialId) id: string,
    @Body(new ZodValidationPipe(documentUploadSchema, 'The sheet is not stored'))
    body: z.output<typeof documentUploadSchema>,
    @UploadedFile() file: UploadedPdf | undefined,
    @CurrentUser() user: AuthUser,
  ): Promise<MaterialDocument> {
    return this.documents.upload(id, body.kind, file, user);
  }

  @Get('materials/:id/documents')
  @Roles('operator', 'lead', 'admin')
  list(@Param('id', materialId) id: string): Promise<MaterialDocument[]> {
    return this.documents.list(id);
  }

  @Get('documents/:id')
  @Roles('operator', 'lead', 'admin')
  async get(@Param('id', documentId) id: string): Promise<StreamableFile> {
    return pdf(await this.documents.open(id));
  }

  /** What a browser tab opens: a signed link made for a signed-in person, not a token. */
  @Get('documents/:id/open')
  @Public()
  async openByLink(
    @Param('id', documentId) id: string,
    @Query(new ZodValidationPipe(documentLinkQuerySchema, 'Open the sheet from Tareline'))
    query: z.output<typeof documentLinkQuerySchema>,
  ): Promise<StreamableFile> {
    return pdf(await this.documents.openByLink(id, query.link));
  }
}
