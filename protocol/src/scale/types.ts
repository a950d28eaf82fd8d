import { z } from 'zod';

/**
 * The contract between scale line codecs (protocol), the simulator and the hub's scale service.
 * Codec implementations live beside this file; this file only fixes the shapes.
 */

export const scaleUnitSchema = z.enum(['g', 'kg', 'lb', 'oz']);
export type ScaleUnit = z.infer<typeof scaleUnitSchema>;

/**
 * Grams in one unit, exact by definition: 1 lb = 0.453 592 37 kg (international yard and pound
 * agreement, 1959); 1 oz avoirdupois = 1/16 lb.
 */
export const GRAMS_PER_UNIT: Readonly<Record<ScaleUnit, number>> = {
  g: 1,
  kg: 1000,
  lb: 453.59237,
  oz: 453.59237 / 16,
};

/**
 * Line formats of our own naming for three common families of lab-balance output:
 * - `headered`: stability and gross/net headers, then a signed zero-padded value and unit
 *   (`ST,GS,+00123.45  g`);
 * - `echo`: answers to commands, a command letter and a status letter (`S S     123.45 g`);
 * - `plain`: a fixed-width signed value and unit, `?` when unstable (`+    123.45 g ?`).
 */
export const scaleFormatSchema = z.enum(['headered', 'echo', 'plain']);
export type ScaleFormat = z.infer<typeof scaleFormatSchema>;

/** What a scale link is set to: a format, or `auto` to recognise it from the first lines. */
export const scaleFormatSettingSchema = z.enum(['auto', ...scaleFormatSchema.options]);
export type ScaleFormatSetting = z.infer<typeof scaleFormatSettingSchema>;

/** One line from a scale, decoded. A codec never throws: anything else is `unreadable`. */
export type ScaleLine =
  | {
      kind: 'weight';
      /** The value as printed, in `unit`. */
      value: number;
      unit: ScaleUnit;
      /** The value in grams (exact factor from {@link GRAMS_PER_UNIT}). */
      grams: number;
      /** The scale's own stability flag. Formats without one report `undefined`. */
      stable: boolean | undefined;
      /** Whether the scale says the value is gross or net (after its own tare). */
      mode: 'gross' | 'net' | 'unknown';
      /** True when the line answers a tare command and carries the tare value. */
      tare?: boolean;
      raw: string;
    }
  | { kind: 'overload'; raw: string }
  | { kind: 'underload'; raw: string }
  /** The scale is busy (e.g. still taring) and answered nothing useful. */
  | { kind: 'busy'; raw: string }
  /** The scale acknowledged a command without a value (e.g. zero done). */
  | { kind: 'ack'; command: ScaleCommand; raw: string }
  /** The scale refused or did not understand a command. */
  | { kind: 'refused'; raw: string }
  | { kind: 'unreadable'; raw: string };

export type ScaleCommand = 'stable-weight' | 'immediate-weight' | 'repeat-weight' | 'tare' | 'zero';

/** What the simulator asks a codec to print. */
export interface EncodableReading {
  grams: number;
  stable: boolean;
  mode: 'gross' | 'net';
  unit: ScaleUnit;
  /** Decimal places the display shows (readability 0.01 g → 2). */
  decimals: number;
  overload?: boolean;
  underload?: boolean;
}

export interface ScaleCodec {
  readonly format: ScaleFormat;
  /** Decode one line (without its line ending). Never throws. */
  parse(line: string): ScaleLine;
  /** Print one reading as this family does (without the line ending). */
  encode(reading: EncodableReading): string;
  /**
   * The command line the hub writes for a command (without line ending), or `undefined` when
   * the family has no such command, in which case the hub keeps a software tare.
   */
  command(command: ScaleCommand): string | undefined;
  /** Simulator side: which command a received line is, or `undefined` if unknown. */
  parseCommand(line: string): ScaleCommand | undefined;
  /** Simulator side: the reply to an unknown command line. */
  encodeRefusal(line: string): string;
  /** Simulator side: the reply to a tare command (carries the tare value where the family does). */
  encodeTareReply(tareGrams: number, reading: EncodableReading): string;
  /** Simulator side: the reply to a command done without a value to report (e.g. zero). */
  encodeAck(command: ScaleCommand): string;
  /** Simulator side: the reply when the balance cannot answer yet (e.g. never settled). */
  encodeBusy(command: ScaleCommand): string;
}

/** Live socket event: one reading of a bench's scale, already normalised by the hub. */
export const readingEventSchema = z.object({
  benchId: z.string(),
  /** Increases by one for every reading the hub judged for this bench. */
  seq: z.number().int().nonnegative(),
  /** Epoch milliseconds when the hub received the line. */
  t: z.number(),
  grossG: z.number(),
  /** Gross minus the tare in effect (the scale's or the hub's software tare). */
  netG: z.number(),
  stable: z.boolean(),
  /** The scale reports overload or underload: the value is meaningless. */
  outOfRange: z.enum(['overload', 'underload']).optional(),
});
export type ReadingEvent = z.infer<typeof readingEventSchema>;

export const scaleStateSchema = z.enum(['connecting', 'online', 'stale', 'offline', 'error']);
export type ScaleState = z.infer<typeof scaleStateSchema>;

/** Live socket event: the state of a bench's scale link. */
export const scaleStatusEventSchema = z.object({
  benchId: z.string(),
  state: scaleStateSchema,
  /** Why, in words an operator or integrator understands (port name, error, format found). */
  detail: z.string(),
});
export type ScaleStatusEvent = z.infer<typeof scaleStatusEventSchema>;
