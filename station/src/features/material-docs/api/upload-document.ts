import {
  materialDocumentSchema,
  type DocumentKind,
  type MaterialDocument,
} from '@tareline/protocol';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';
import { materialDocumentsQueryKey } from '../../../lib/material-documents';

export function uploadDocument(
  materialId: string,
  kind: DocumentKind,
  file: File,
): Promise<MaterialDocument> {
  const form = new FormData();
  form.append('kind', kind);
  form.append('file', file);
  return apiRequest(
    `/materials/${encodeURIComponent(materialId)}/documents`,
    materialDocumentSchema,
    { method: 'POST', body: form },
  );
}

/** Uploads a new version of a sheet; the list is read again afterwards. */
export function useUploadDocument(materialId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ kind, file }: { kind: DocumentKind; file: File }) =>
      uploadDocument(materialId, kind, file),
    onSuccess: () => client.invalidateQueries({ queryKey: materialDocumentsQueryKey(materialId) }),
  });
}
