import { z } from 'zod';

/**
 * Scripted scenarios for the simulator (`--script FILE`, `POST /api/benches/:id/simulator`):
 * a list of steps run one after the other. Times are simulated seconds; masses are grams.
 */
const grams = z.number().finite().positive();

export const simulatorStepSchema = z.discriminatedUnion('do', [
  /** Put an empty cup of this mass on the pan. */
  z.object({ do: z.literal('place-cup'), massG: grams.max(100_000) }),
  /** Take the cup (and what is in it) off the pan. */
  z.object({ do: z.literal('lift-cup') }),
  /** Put the lifted cup back. */
  z.object({ do: z.literal('return-cup') }),
  /** Wait until the hub sends a tare command (or the operator presses tare); fail after timeoutS. */
  z.object({ do: z.literal('wait-for-tare'), timeoutS: z.number().finite().positive().optional() }),
  /** Press the balance's own tare key. */
  z.object({ do: z.literal('tare') }),
  /** Pour this many grams into the cup at about this flow rate; ends when the pour has stopped. */
  z.object({
    do: z.literal('pour'),
    grams: grams.max(100_000),
    rateGPerS: z.number().finite().positive().max(1000),
  }),
  /** Wait until the balance reports a stable weight again. */
  z.object({ do: z.literal('settle') }),
  z.object({ do: z.literal('wait'), seconds: z.number().finite().nonnegative().max(3600) }),
  /** Pull the balance's cable: no lines until `replug`. */
  z.object({ do: z.literal('unplug') }),
  /** Put a reference weight of this mass on the pan (beside any cup), as for a scale check. */
  z.object({ do: z.literal('place-weight'), massG: grams.max(100_000) }),
  /** Take the reference weight off the pan. */
  z.object({ do: z.literal('lift-weight') }),
  /**
   * The balance's own faults, so a scale check can fail on purpose: a fixed error on any load
   * (g), a span error (parts per million of the load), and the spread of the reading from one
   * placement to the next (standard deviation, g). Fields left out are unchanged.
   */
  z.object({
    do: z.literal('set-scale-error'),
    offsetG: z.number().finite().min(-1000).max(1000).optional(),
    spanPpm: z.number().finite().min(-100_000).max(100_000).optional(),
    spreadG: z.number().finite().nonnegative().max(1000).optional(),
  }),
  z.object({ do: z.literal('replug') }),
]);
export type SimulatorStep = z.infer<typeof simulatorStepSchema>;

export const simulatorScriptSchema = z.array(simulatorStepSchema).max(1000);
export type SimulatorScript = z.infer<typeof simulatorScriptSchema>;
