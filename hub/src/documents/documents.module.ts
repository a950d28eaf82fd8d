import { Module } from '@nestjs/common';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { loadOrCreateSecret } from '../auth/secrets.js';
import { MaterialsModule } from '../materials/materials.module.js';
import { DocumentFiles } from './document-files.js';
import { DOCUMENT_LINK_KEY, DocumentLinks } from './document-links.js';
import { DocumentUploadInterceptor } from './document-upload.interceptor.js';
import { DocumentsController } from './documents.controller.js';
import { DocumentsRepository } from './documents.repository.js';
import { DocumentsService } from './documents.service.js';

/** Materials' data sheets (SDS, TDS): PDFs under the data folder, opened by signed-in people. */
@Module({
  imports: [MaterialsModule],
  controllers: [DocumentsController],
  providers: [
    {
      // A key of its own: a leaked link key signs no session.
      provide: DOCUMENT_LINK_KEY,
      inject: [APP_CONFIG],
      useFactory: (config: AppConfig) =>
        loadOrCreateSecret(config.data.dir, 'document-link-key', undefined),
    },
    DocumentLinks,
    DocumentFiles,
    DocumentsRepository,
    DocumentsService,
    DocumentUploadInterceptor,
  ],
  exports: [DocumentsService],
})
export class DocumentsModule {}
