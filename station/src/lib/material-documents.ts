import {
  DOCUMENT_LINK_TTL_MS,
  materialDocumentSchema,
  type MaterialDocument,
} from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from './api-client';

export const materialDocumentsQueryKey = (materialId: string) =>
  ['materials', materialId, 'documents'] as const;

export function getMaterialDocuments(materialId: string): Promise<MaterialDocument[]> {
  return apiRequest(
    `/materials/${encodeURIComponent(materialId)}/documents`,
    z.array(materialDocumentSchema),
  );
}

/**
 * A material's data sheets, newest first. Each carries a link a browser tab opens for a few
 * minutes, so the list is fetched again before the links run out.
 */
export function useMaterialDocuments(materialId: string | undefined) {
  return useQuery({
    queryKey: materialDocumentsQueryKey(materialId ?? ''),
    queryFn: () => getMaterialDocuments(materialId!),
    enabled: !!materialId,
    staleTime: DOCUMENT_LINK_TTL_MS / 2,
    refetchInterval: DOCUMENT_LINK_TTL_MS / 2,
  });
}

/** The newest safety data sheet of a list, if any. */
export function latestSds(documents: MaterialDocument[] | undefined): MaterialDocument | undefined {
  return documents?.find((d) => d.kind === 'sds');
}
