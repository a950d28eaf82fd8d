import { simulatorScriptSchema, type SimulatorStep } from '@tareline/protocol';
import { useMutation } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '../../../lib/api-client';

const simulatorRunSchema = z.object({ benchId: z.string(), steps: z.number() });

/** Runs steps on a bench's simulated scale; the hub answers once they have all happened. */
export function runSimulator(benchId: string, steps: SimulatorStep[]) {
  return apiRequest(`/benches/${encodeURIComponent(benchId)}/simulator`, simulatorRunSchema, {
    method: 'POST',
    body: JSON.stringify(simulatorScriptSchema.parse(steps)),
  });
}

export function useRunSimulator(benchId: string) {
  return useMutation({ mutationFn: (steps: SimulatorStep[]) => runSimulator(benchId, steps) });
}
