import { z } from 'zod';
import { recordIdSchema } from './text.js';

/** The most a data sheet may weigh, bytes: 20 MB. */
export const MAX_DOCUMENT_BYTES = 20 * 1024 * 1024;

/** How long a link to open a sheet in a browser tab works: the station fetches new ones sooner. */
export const DOCUMENT_LINK_TTL_MS = 10 * 60_000;

/** `sds`: safety data sheet; `tds`: technical data sheet. */
export const documentKindSchema = z.enum(['sds', 'tds'], {
  error: 'Say which sheet it is: sds (safety) or tds (technical)',
});
export type DocumentKind = z.infer<typeof documentKindSchema>;

/** Path parameter of `/api/documents/:id`. */
export const documentIdSchema = recordIdSchema('document');

/** Form fields of `POST /api/materials/:id/documents` beside the file itself. */
export const documentUploadSchema = z.object({ kind: documentKindSchema });

/** Query of the signed link a browser tab opens without the session token. */
export const documentLinkQuerySchema = z.object({
  link: z
    .string()
    .max(200)
    .regex(/^\d{1,15}\.[A-Za-z0-9_-]{20,100}$/u, {
      error: 'This link is not one Tareline made: open the sheet again from Tareline',
    }),
});

export const materialDocumentSchema = z.object({
  id: z.string(),
  materialId: z.string(),
  kind: documentKindSchema,
  fileName: z.string(),
  sizeBytes: z.number().int(),
  uploadedAt: z.string(),
  uploadedBy: z.object({ id: z.string(), name: z.string() }),
  /**
   * A link that opens the PDF in a new browser tab for a few minutes, for a tab cannot send the
   * session token. The API itself reads `/api/documents/:id` with the token.
   */
  openUrl: z.string(),
});
export type MaterialDocument = z.infer<typeof materialDocumentSchema>;

/** Whether bytes are a PDF: its header `%PDF-` at the start (ISO 32000-1:2008, 7.5.2). */
export function looksLikePdf(bytes: Uint8Array): boolean {
  const header = [0x25, 0x50, 0x44, 0x46, 0x2d]; // %PDF-
  return bytes.length >= header.length && header.every((b, i) => bytes[i] === b);
}
