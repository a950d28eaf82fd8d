import { createHash } from 'node:crypto';
import type { ReadStream } from 'node:fs';
import { Inject, Injectable, Logger } from '@nestjs/common';
import {
  looksLikePdf,
  MAX_DOCUMENT_BYTES,
  type DocumentKind,
  type MaterialDocument,
} from '@tareline/protocol';
import type { AuthUser } from '../auth/auth-user.js';
import {
  InvalidInput,
  NotFound,
  NotSignedIn,
  TooLarge,
  UnsupportedType,
} from '../common/domain-errors.js';
import { MaterialsService } from '../materials/materials.service.js';
import { DocumentFiles } from './document-files.js';
import { DocumentLinks } from './document-links.js';
import { DocumentsRepository, type DocumentRow } from './documents.repository.js';

/** What the upload interceptor hands over: the file's bytes and what the browser said of it. */
export interface UploadedPdf {
  buffer: Buffer;
  size: number;
  originalname: string;
}

/** A document ready to stream. */
export interface OpenDocument {
  stream: ReadStream;
  sizeBytes: number;
  fileName: string;
}

/** A name safe inside a `Content-Disposition` header and a list: printable ASCII only. */
function plainFileName(name: string): string {
  const plain = name
    .replace(/[^\x20-\x7e]/gu, '_')
    .replace(/["\\/]/gu, '_')
    .trim()
    .slice(0, 120);
  return plain.toLowerCase().endsWith('.pdf') ? plain : `${plain || 'sheet'}.pdf`;
}

/** A material's data sheets: kept as PDFs under the data folder, every version listed. */
@Injectable()
export class DocumentsService {
  private readonly logger = new Logger('Documents');

  constructor(
    @Inject(DocumentsRepository) private readonly repository: DocumentsRepository,
    @Inject(DocumentFiles) private readonly files: DocumentFiles,
    @Inject(DocumentLinks) private readonly links: DocumentLinks,
    @Inject(MaterialsService) private readonly materials: MaterialsService,
  ) {}

  private toDocument(row: DocumentRow): MaterialDocument {
    return {
      id: row.id,
      materialId: row.materialId,
      kind: row.kind,
      fileName: row.fileName,
      sizeBytes: row.sizeBytes,
      uploadedAt: row.uploadedAt.toISOString(),
      uploadedBy: { id: row.uploadedById, name: row.uploadedByName },
      openUrl: this.links.urlFor(row.id),
    };
  }

  /** Stores a new version of a material's sheet. Only a PDF, told by its first bytes, is taken. */
  async upload(
    materialId: string,
    kind: DocumentKind,
    file: UploadedPdf | undefined,
    user: AuthUser,
  ): Promise<MaterialDocument> {
    if (!file) {
      throw new InvalidInput('Attach the data sheet as a PDF', [
        { path: 'file', message: 'Choose a PDF file' },
      ]);
    }
    // The interceptor stops at the limit; this holds if it is ever configured otherwise.
    if (file.size > MAX_DOCUMENT_BYTES) throw tooLarge();
    const material = await this.materials.get(materialId);
    if (!looksLikePdf(file.buffer)) {
      throw new UnsupportedType(
        'This file is not a PDF: save the data sheet as a PDF and upload that',
        [{ path: 'file', message: 'Only PDF files are taken' }],
      );
    }
    const row = await this.repository.insert({
      materialId: material.id,
      kind,
      fileName: plainFileName(file.originalname),
      sizeBytes: file.size,
      sha256: createHash('sha256').update(file.buffer).digest('hex'),
      uploadedById: user.id,
      uploadedByName: user.name,
    });
    try {
      await this.files.write(row.id, file.buffer);
    } catch (err) {
      // A row without its file would list a sheet nobody can open.
      await this.repository.remove(row.id);
      throw err;
    }
    this.logger.log(`${kind.toUpperCase()} for ${material.name} uploaded by ${user.name}`);
    return this.toDocument(row);
  }

  /** Every version of the material's sheets, newest first. */
  async list(materialId: string): Promise<MaterialDocument[]> {
    await this.materials.get(materialId);
    const rows = await this.repository.listFor(materialId);
    return rows.map((row) => this.toDocument(row));
  }

  /** The PDF of a document, for a signed-in person. */
  async open(id: string): Promise<OpenDocument> {
    const row = await this.repository.findById(id);
    const file = row && (await this.files.open(row.id));
    if (!row || !file) throw new NotFound(`No document ${id}`);
    return { ...file, fileName: row.fileName };
  }

  /** The PDF of a document through a signed link, for a browser tab without the token. */
  async openByLink(id: string, link: string): Promise<OpenDocument> {
    if (!this.links.verify(id, link)) {
      throw new NotSignedIn('This link has run out: open the sheet again from Tareline');
    }
    return this.open(id);
  }
}

/** A file over the limit, in words (multer's own error says only "File too large"). */
export function tooLarge(): TooLarge {
  return new TooLarge(
    `The file is larger than ${MAX_DOCUMENT_BYTES / 1024 / 1024} MB: upload a smaller PDF`,
    [{ path: 'file', message: 'At most 20 MB' }],
  );
}
