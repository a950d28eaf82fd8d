import { accuracyAnswerSchema, type AccuracyAnswer } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';

export type AccuracyGroup = AccuracyAnswer['groupBy'];
export type AccuracyBucket = AccuracyAnswer['bucket'];

export function getAccuracy(groupBy: AccuracyGroup, bucket: AccuracyBucket) {
  return apiRequest(`/accuracy?groupBy=${groupBy}&bucket=${bucket}`, accuracyAnswerSchema);
}

/** Accuracy per material, bench or operator by day or week, as the hub computes it. */
export function useAccuracy(groupBy: AccuracyGroup, bucket: AccuracyBucket) {
  return useQuery({
    queryKey: ['accuracy', groupBy, bucket],
    queryFn: () => getAccuracy(groupBy, bucket),
  });
}
