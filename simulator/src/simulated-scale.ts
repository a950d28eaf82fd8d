import {
  decimalsFor,
  getCodec,
  scaleFormatSchema,
  scaleUnitSchema,
  simulatorScriptSchema,
  type EncodableReading,
  type ScaleCodec,
  type ScaleCommand,
  type ScaleFormat,
  type ScaleUnit,
  type SimulatorStep,
} from '@tareline/protocol';
import { SeededRandom } from './random.js';

export interface SimulatorOptions {
  format: ScaleFormat;
  /** Lines a second while printing continuously. */
  rateHz: number;
  /** Scale interval d in grams: the display steps by this much. */
  readabilityG: number;
  capacityG: number;
  /** Standard deviation of the reading noise in grams (default: 0.4 d). */
  noiseG: number;
  /** Slow drift of the zero point. */
  driftGPerMin: number;
  unit: ScaleUnit;
  /**
   * Print every reading by itself. When false, an `echo` or `headered` balance prints only when
   * asked (`echo` starts printing on its repeat command); `plain` has no commands and always prints.
   */
  continuous: boolean;
  /** Simulated time runs this many times faster than the wall clock, for tests. */
  speed: number;
  /** Same seed, same noise. */
  seed: number;
}

export const DEFAULT_SIMULATOR_OPTIONS: Readonly<SimulatorOptions> = Object.freeze({
  format: 'headered',
  rateHz: 20,
  readabilityG: 0.01,
  capacityG: 4000,
  noiseG: 0.004,
  driftGPerMin: 0.005,
  unit: 'g',
  continuous: true,
  speed: 1,
  seed: 1,
});

/** Raised into pending promises (pour, settle, scripts) when the simulator is stopped. */
export class SimulatorStoppedError extends Error {
  constructor() {
    super('The simulated scale was stopped');
    this.name = 'SimulatorStoppedError';
  }
}

// The physical model. Values are plausible for a 4 kg / 0.01 g bench balance; they are chosen
// to look right on a gauge, not measured on any particular instrument.
/** Longest physics step; a tick at a low print rate is split into steps this long. */
const MAX_STEP_S = 0.01;
/** Time constant of the pan's damped oscillation after something lands on it or leaves it. */
const OSCILLATION_TAU_S = 0.3;
const OSCILLATION_HZ = 2.5;
/** The balance calls a reading stable only this long after the last disturbance, at least. */
const SETTLE_MIN_S = 0.4;
/** A pour reaches its full flow after this long... */
const POUR_RAMP_S = 0.4;
/** ...and the pourer slows down over about the last this-many seconds of flow. */
const POUR_TAPER_S = 0.6;
/** The slowest trickle at the end of a pour, as a share of the full flow. */
const POUR_MIN_FLOW_SHARE = 0.08;
/** Force of the falling stream, seen as extra grams per gram-per-second of flow. */
const STREAM_IMPACT_S = 0.04;
/** Reading noise while liquid is landing, as a multiple of the resting noise. */
const POUR_NOISE_FACTOR = 3;
/** A tare or a stable-weight request waits this long for stability before answering busy. */
const COMMAND_TIMEOUT_S = 5;
/** Readings further below zero than this share of capacity are an underload (pan lifted off). */
const UNDERLOAD_SHARE = 0.05;
/** Above capacity by more than this many scale intervals the balance shows overload. */
const OVERLOAD_MARGIN_D = 9;

/** The balance's own faults, as `set-scale-error` sets them (see the protocol's script step). */
export interface ScaleErrors {
  /** A fixed error on any load on the pan, g (zeroing does not remove it). */
  offsetG: number;
  /** Span error, parts per million of the load. */
  spanPpm: number;
  /** Standard deviation of the reading from one placement of a weight to the next, g. */
  spreadG: number;
}

interface Pour {
  grams: number;
  rateGPerS: number;
  pouredG: number;
  startedS: number;
  resolve: () => void;
  reject: (error: Error) => void;
}

interface Waiter {
  ready: (scale: SimulatedScale) => boolean;
  resolve: () => void;
  reject: (error: Error) => void;
  /** Simulated time after which `onTimeout` runs instead. */
  deadlineS?: number;
  onTimeout?: () => void;
}

interface PendingRequest {
  command: 'tare' | 'zero' | 'stable-weight';
  /** Whether the answer goes out as a line (a hub's command) or not (the tare key). */
  reply: boolean;
  deadlineS: number;
}

interface Reading {
  grossG: number;
  stable: boolean;
  overload: boolean;
  underload: boolean;
}

function checkOptions(options: SimulatorOptions): void {
  const positive: Array<keyof SimulatorOptions> = ['rateHz', 'readabilityG', 'capacityG', 'speed'];
  for (const key of positive) {
    const value = options[key];
    if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
      throw new TypeError(`"${key}" must be a positive number, got ${String(value)}`);
    }
  }
  for (const key of ['noiseG', 'driftGPerMin'] as const) {
    if (!Number.isFinite(options[key]) || options[key] < 0) {
      throw new TypeError(`"${key}" must be zero or a positive number, got ${options[key]}`);
    }
  }
  if (!Number.isFinite(options.seed)) throw new TypeError(`"seed" must be a number`);
  if (!scaleFormatSchema.safeParse(options.format).success) {
    throw new TypeError(`"format" must be one of ${scaleFormatSchema.options.join(', ')}`);
  }
  if (!scaleUnitSchema.safeParse(options.unit).success) {
    throw new TypeError(`"unit" must be one of ${scaleUnitSchema.options.join(', ')}`);
  }
}

/**
 * A virtual lab balance: a cup on the pan, pours with a flow rate, noise, settling, drift, its
 * own tare and zero, printing lines through one of the protocol's codecs and answering that
 * family's commands. Transport-agnostic: lines go out through `onLine` and commands come in
 * through `receive`, so the same object sits behind a pty, a TCP socket or the hub's mock port.
 *
 * Time is simulated and advances in ticks of one print period. `start()` ties the ticks to the
 * wall clock (times `speed`); `advance(seconds)` runs them at once, for tests.
 */
export class SimulatedScale {
  readonly options: Readonly<SimulatorOptions>;
  private readonly codec: ScaleCodec;
  private readonly random: SeededRandom;
  private readonly decimals: number;
  private readonly lineListeners = new Set<(line: string) => void>();
  private readonly plugListeners = new Set<(plugged: boolean) => void>();

  private timeS = 0;
  private ticks = 0;
  private timer: ReturnType<typeof setInterval> | undefined;
  private clockStartMs = 0;
  private ticksAtClockStart = 0;

  private isPlugged = true;
  private printing: boolean;
  private cupMassG = 0;
  private contentsG = 0;
  private cupOnPan = false;
  private zeroOffsetG = 0;
  private driftG = 0;
  private balanceTareG: number | undefined;
  private pourState: Pour | undefined;
  private oscillationAmpG = 0;
  private oscillationStartS = 0;
  private lastDisturbanceS = -Infinity;
  private last: Reading | undefined;
  private readonly waiters: Waiter[] = [];
  private readonly requests: PendingRequest[] = [];
  private readonly tareListeners = new Set<() => void>();
  private weightMassG = 0;
  private weightOnPan = false;
  /** This placement's share of the spread, drawn when the weight lands. */
  private placementErrorG = 0;
  private faults: ScaleErrors = { offsetG: 0, spanPpm: 0, spreadG: 0 };

  constructor(options: Partial<SimulatorOptions> = {}) {
    const defined = Object.fromEntries(
      Object.entries(options).filter(([, value]) => value !== undefined),
    ) as Partial<SimulatorOptions>;
    const readabilityG = defined.readabilityG ?? DEFAULT_SIMULATOR_OPTIONS.readabilityG;
    const resolved: SimulatorOptions = {
      ...DEFAULT_SIMULATOR_OPTIONS,
      // Noise of the order of the readability unless told otherwise.
      noiseG: readabilityG * 0.4,
      ...defined,
    };
    checkOptions(resolved);
    this.options = Object.freeze(resolved);
    this.codec = getCodec(resolved.format);
    this.random = new SeededRandom(resolved.seed);
    this.decimals = decimalsFor(resolved.readabilityG, resolved.unit);
    this.printing = resolved.continuous || resolved.format === 'plain';
  }

  // ---- clock -------------------------------------------------------------------------------

  /** Run simulated time against the wall clock (times `speed`). */
  start(): void {
    if (this.timer) return;
    const ticksPerMs = (this.options.rateHz * this.options.speed) / 1000;
    this.clockStartMs = performance.now();
    this.ticksAtClockStart = this.ticks;
    this.timer = setInterval(
      () => {
        const due =
          Math.floor((performance.now() - this.clockStartMs) * ticksPerMs) -
          (this.ticks - this.ticksAtClockStart);
        // A stalled event loop must not turn into a burst of thousands of lines.
        for (let i = 0; i < Math.min(due, 1000); i++) this.tick();
        if (due > 1000) this.ticksAtClockStart -= due - 1000;
      },
      Math.max(1, 1 / ticksPerMs),
    );
  }

  /** Stop the clock; pending pours, waits and scripts fail with {@link SimulatorStoppedError}. */
  stop(): void {
    if (this.timer) clearInterval(this.timer);
    this.timer = undefined;
    const error = new SimulatorStoppedError();
    this.pourState?.reject(error);
    this.pourState = undefined;
    for (const waiter of this.waiters.splice(0)) waiter.reject(error);
  }

  /** Run `seconds` of simulated time now, without waiting (tests, benchmarks). */
  advance(seconds: number): void {
    const ticks = Math.round(seconds * this.options.rateHz);
    for (let i = 0; i < ticks; i++) this.tick();
  }

  /** Simulated seconds since the simulator was made. */
  get timeSeconds(): number {
    return this.timeS;
  }

  // ---- what the balance shows --------------------------------------------------------------

  /** The load as the balance weighs it without noise: pan minus zero point, to the interval. */
  get grossG(): number {
    return this.roundToInterval(this.trueGrossG());
  }

  /** `grossG` minus the balance's own tare. */
  get netG(): number {
    return this.roundToInterval(this.trueGrossG() - (this.balanceTareG ?? 0));
  }

  /** The balance's own tare, or `undefined` when none is set. */
  get tareG(): number | undefined {
    return this.balanceTareG;
  }

  /** The stability flag of the last reading. */
  get stable(): boolean {
    return this.isStable();
  }

  get plugged(): boolean {
    return this.isPlugged;
  }

  get pouring(): boolean {
    return this.pourState !== undefined;
  }

  get cupPlaced(): boolean {
    return this.cupOnPan;
  }

  /** Grams in the cup so far. */
  get contentsInCupG(): number {
    return this.contentsG;
  }

  // ---- listeners ---------------------------------------------------------------------------

  /** Each line the balance prints (without CR LF), only while plugged in. */
  onLine(listener: (line: string) => void): () => void {
    this.lineListeners.add(listener);
    return () => this.lineListeners.delete(listener);
  }

  onPlug(listener: (plugged: boolean) => void): () => void {
    this.plugListeners.add(listener);
    return () => this.plugListeners.delete(listener);
  }

  /** Called whenever a tare is done, by a command or the key. */
  onTare(listener: () => void): () => void {
    this.tareListeners.add(listener);
    return () => this.tareListeners.delete(listener);
  }

  // ---- the hub's side of the cable ---------------------------------------------------------

  /** A command line from the hub (without line ending); the answer comes through `onLine`. */
  receive(line: string): void {
    if (!this.isPlugged) return;
    const command = this.codec.parseCommand(line);
    if (command === undefined) {
      this.print(this.codec.encodeRefusal(line));
      return;
    }
    this.handleCommand(command);
  }

  private handleCommand(command: ScaleCommand): void {
    switch (command) {
      case 'immediate-weight':
        this.print(this.encode(this.last ?? this.read()));
        return;
      case 'repeat-weight':
        this.printing = true;
        return;
      case 'stable-weight':
      case 'tare':
      case 'zero':
        this.requests.push({ command, reply: true, deadlineS: this.timeS + COMMAND_TIMEOUT_S });
        return;
    }
  }

  // ---- the operator's side -----------------------------------------------------------------

  /** Put an empty cup of `massG` on the pan (replacing any cup there was). */
  placeCup(massG: number): void {
    if (!(massG > 0) || !Number.isFinite(massG)) {
      throw new RangeError(`A cup must weigh more than 0 g, got ${massG}`);
    }
    this.cupMassG = massG;
    this.contentsG = 0;
    this.cupOnPan = true;
    this.disturb(0.2 + 0.02 * massG);
  }

  /** Lift the cup off the pan: a tared balance now reads the cup's weight as negative. */
  liftCup(): void {
    if (!this.cupOnPan) return;
    this.cupOnPan = false;
    this.disturb(0.1 + 0.005 * (this.cupMassG + this.contentsG));
  }

  returnCup(): void {
    if (this.cupOnPan || this.cupMassG === 0) return;
    this.cupOnPan = true;
    this.disturb(0.2 + 0.02 * (this.cupMassG + this.contentsG));
  }

  /** Put a reference weight on the pan; a weight already there is taken off first. */
  placeWeight(massG: number): void {
    if (!(massG > 0) || !Number.isFinite(massG)) {
      throw new RangeError(`A reference weight must weigh more than 0 g, got ${massG}`);
    }
    this.weightMassG = massG;
    this.weightOnPan = true;
    // Only a set spread draws from the noise source, so scripts without one read as before.
    this.placementErrorG = this.faults.spreadG > 0 ? this.random.gaussian(this.faults.spreadG) : 0;
    this.disturb(0.2 + 0.02 * massG);
  }

  liftWeight(): void {
    if (!this.weightOnPan) return;
    this.weightOnPan = false;
    this.disturb(0.1 + 0.005 * this.weightMassG);
  }

  get weightPlaced(): boolean {
    return this.weightOnPan;
  }

  /** The balance's own faults now in effect. */
  get scaleErrors(): Readonly<ScaleErrors> {
    return this.faults;
  }

  /** Changes the balance's own faults; fields left out stay as they were. */
  setScaleErrors(errors: Partial<ScaleErrors>): void {
    const next = { ...this.faults };
    for (const key of ['offsetG', 'spanPpm', 'spreadG'] as const) {
      const value = errors[key];
      if (value === undefined) continue;
      if (!Number.isFinite(value) || (key === 'spreadG' && value < 0)) {
        throw new RangeError(`"${key}" must be a finite number${key === 'spreadG' ? ' ≥ 0' : ''}`);
      }
      next[key] = value;
    }
    this.faults = next;
  }

  /**
   * Pour `grams` into the cup at about `rateGPerS`: the flow builds up, runs, and tapers off as
   * the pourer nears the amount. Resolves when the flow has stopped (not when the reading has
   * settled: see {@link settle}). A new pour ends the one running.
   */
  pour(grams: number, rateGPerS: number): Promise<void> {
    if (!(grams > 0) || !(rateGPerS > 0) || !Number.isFinite(grams + rateGPerS)) {
      return Promise.reject(
        new RangeError(`A pour needs positive grams and rate, got ${grams} g at ${rateGPerS} g/s`),
      );
    }
    this.stopPour();
    return new Promise<void>((resolve, reject) => {
      this.pourState = { grams, rateGPerS, pouredG: 0, startedS: this.timeS, resolve, reject };
    });
  }

  /** Stop the running pour where it is. */
  stopPour(): void {
    const pour = this.pourState;
    if (!pour) return;
    this.pourState = undefined;
    this.disturb(0.05 + 0.015 * pour.rateGPerS);
    pour.resolve();
  }

  /** Resolves at the first reading the balance flags stable with nothing being poured. */
  settle(): Promise<void> {
    return this.waitUntil((scale) => !scale.pouring && scale.isStable());
  }

  /** Press the balance's tare key: it tares at the next stable reading. */
  pressTare(): void {
    this.requests.push({
      command: 'tare',
      reply: false,
      deadlineS: this.timeS + COMMAND_TIMEOUT_S,
    });
  }

  unplug(): void {
    if (!this.isPlugged) return;
    this.isPlugged = false;
    for (const listener of [...this.plugListeners]) listener(false);
  }

  replug(): void {
    if (this.isPlugged) return;
    this.isPlugged = true;
    for (const listener of [...this.plugListeners]) listener(true);
  }

  /** Run the steps one after the other; resolves when the last is done. */
  async runScript(steps: SimulatorStep[]): Promise<void> {
    for (const step of simulatorScriptSchema.parse(steps)) {
      await this.runStep(step);
    }
  }

  private async runStep(step: SimulatorStep): Promise<void> {
    switch (step.do) {
      case 'place-cup':
        return this.placeCup(step.massG);
      case 'lift-cup':
        return this.liftCup();
      case 'return-cup':
        return this.returnCup();
      case 'wait-for-tare':
        return this.waitForTare(step.timeoutS);
      case 'tare': {
        const done = this.nextTare();
        this.pressTare();
        return done;
      }
      case 'pour':
        return this.pour(step.grams, step.rateGPerS);
      case 'settle':
        return this.settle();
      case 'wait': {
        const until = this.timeS + step.seconds;
        return this.waitUntil((scale) => scale.timeS >= until - 1e-9);
      }
      case 'unplug':
        return this.unplug();
      case 'place-weight':
        return this.placeWeight(step.massG);
      case 'lift-weight':
        return this.liftWeight();
      case 'set-scale-error': {
        const { do: _do, ...errors } = step;
        return this.setScaleErrors(errors);
      }
      case 'replug':
        return this.replug();
    }
  }

  /**
   * Resolves at the next tare, by the hub's command or the key. A family without a tare command
   * (`plain`) never sees the hub's tare — the hub keeps a software tare — so it goes on at once.
   */
  waitForTare(timeoutS?: number): Promise<void> {
    if (this.codec.command('tare') === undefined) return Promise.resolve();
    return this.nextTare(timeoutS);
  }

  private nextTare(timeoutS?: number): Promise<void> {
    return new Promise<void>((resolve, reject) => {
      let tared = false;
      const off = this.onTare(() => {
        tared = true;
      });
      const waiter: Waiter = {
        ready: () => tared,
        resolve: () => {
          off();
          resolve();
        },
        reject: (error) => {
          off();
          reject(error);
        },
      };
      if (timeoutS !== undefined) {
        waiter.deadlineS = this.timeS + timeoutS;
        waiter.onTimeout = () => {
          off();
          reject(new Error(`No tare within ${timeoutS} s`));
        };
      }
      this.waiters.push(waiter);
    });
  }

  private waitUntil(ready: (scale: SimulatedScale) => boolean): Promise<void> {
    return new Promise<void>((resolve, reject) => this.waiters.push({ ready, resolve, reject }));
  }

  // ---- the physics -------------------------------------------------------------------------

  private tick(): void {
    const period = 1 / this.options.rateHz;
    const steps = Math.max(1, Math.ceil(period / MAX_STEP_S - 1e-9));
    for (let i = 0; i < steps; i++) this.step(period / steps);
    this.ticks += 1;
    const reading = this.read();
    this.last = reading;
    this.answerRequests(reading);
    if (this.printing) this.print(this.encode(reading));
    this.wakeWaiters();
  }

  private step(dt: number): void {
    this.timeS += dt;
    this.driftG += (this.options.driftGPerMin / 60) * dt;
    const pour = this.pourState;
    if (!pour) return;
    const remaining = pour.grams - pour.pouredG;
    const poured = Math.min(this.flowGPerS(pour) * dt, remaining);
    pour.pouredG += poured;
    // Into the cup, wherever it is (a lifted cup keeps filling but weighs nothing on the pan).
    this.contentsG += poured;
    this.lastDisturbanceS = this.timeS;
    if (pour.grams - pour.pouredG <= 1e-9) this.stopPour();
  }

  private flowGPerS(pour: Pour): number {
    const ramp = Math.min(1, (this.timeS - pour.startedS) / POUR_RAMP_S);
    const remaining = pour.grams - pour.pouredG;
    const taper = Math.max(POUR_MIN_FLOW_SHARE, remaining / (pour.rateGPerS * POUR_TAPER_S));
    return pour.rateGPerS * Math.max(0.05, Math.min(ramp, taper, 1));
  }

  private panLoadG(): number {
    const weightG = this.weightOnPan ? this.weightMassG + this.placementErrorG : 0;
    // Without a cup, what is poured lands straight on the pan and is counted in contentsG.
    if (this.cupMassG === 0) return this.contentsG + weightG;
    return (this.cupOnPan ? this.cupMassG + this.contentsG : 0) + weightG;
  }

  private trueGrossG(): number {
    const loadG = this.panLoadG();
    const { offsetG, spanPpm } = this.faults;
    // The faults act on the load only: an empty pan still reads zero after zeroing.
    const errorG = loadG > 0 ? offsetG + (loadG * spanPpm) / 1e6 : 0;
    return loadG + errorG + this.driftG - this.zeroOffsetG;
  }

  private oscillationG(): number {
    const t = this.timeS - this.oscillationStartS;
    return (
      this.oscillationAmpG *
      Math.exp(-t / OSCILLATION_TAU_S) *
      Math.sin(2 * Math.PI * OSCILLATION_HZ * t + Math.PI / 2)
    );
  }

  private residualAmplitudeG(): number {
    return (
      this.oscillationAmpG * Math.exp(-(this.timeS - this.oscillationStartS) / OSCILLATION_TAU_S)
    );
  }

  /** Something landed on or left the pan: it swings, and stability starts over. */
  private disturb(amplitudeG: number): void {
    this.oscillationAmpG = this.residualAmplitudeG() + amplitudeG;
    this.oscillationStartS = this.timeS;
    this.lastDisturbanceS = this.timeS;
  }

  private isStable(): boolean {
    return (
      !this.pourState &&
      this.timeS - this.lastDisturbanceS >= SETTLE_MIN_S - 1e-9 &&
      this.residualAmplitudeG() < this.options.readabilityG / 2
    );
  }

  private read(): Reading {
    const pour = this.pourState;
    const impactG = pour && this.cupOnPan ? this.flowGPerS(pour) * STREAM_IMPACT_S : 0;
    const noise = this.random.gaussian(this.options.noiseG * (pour ? POUR_NOISE_FACTOR : 1));
    const grossG = this.trueGrossG() + impactG + this.oscillationG() + noise;
    const { capacityG, readabilityG } = this.options;
    return {
      grossG: this.roundToInterval(grossG),
      stable: this.isStable(),
      // Capacity limits what is on the pan, whatever the zero point says.
      overload: grossG + this.zeroOffsetG > capacityG + OVERLOAD_MARGIN_D * readabilityG,
      underload: grossG < -UNDERLOAD_SHARE * capacityG,
    };
  }

  private roundToInterval(grams: number): number {
    const d = this.options.readabilityG;
    const rounded = Math.round(grams / d) * d;
    // Strip binary noise such as 123.45000000000002 and never show -0.
    return Number(rounded.toFixed(10)) + 0;
  }

  private encode(reading: Reading): string {
    return this.codec.encode(this.toEncodable(reading));
  }

  private toEncodable(reading: Reading): EncodableReading {
    const tare = this.balanceTareG;
    return {
      grams: this.roundToInterval(reading.grossG - (tare ?? 0)),
      stable: reading.stable,
      mode: tare === undefined ? 'gross' : 'net',
      unit: this.options.unit,
      decimals: this.decimals,
      ...(reading.overload ? { overload: true } : {}),
      ...(reading.underload ? { underload: true } : {}),
    };
  }

  private answerRequests(reading: Reading): void {
    for (const request of this.requests.splice(0)) {
      const outOfRange = reading.overload || reading.underload;
      if (!reading.stable || outOfRange) {
        if (this.timeS < request.deadlineS) {
          this.requests.push(request);
        } else if (request.reply) {
          this.print(this.codec.encodeBusy(request.command));
        }
        continue;
      }
      switch (request.command) {
        case 'stable-weight':
          this.print(this.encode(reading));
          break;
        case 'tare': {
          this.balanceTareG = reading.grossG;
          if (request.reply) {
            this.print(this.codec.encodeTareReply(reading.grossG, this.toEncodable(reading)));
          }
          for (const listener of [...this.tareListeners]) listener();
          break;
        }
        case 'zero':
          this.zeroOffsetG += reading.grossG;
          this.balanceTareG = undefined;
          if (request.reply) this.print(this.codec.encodeAck('zero'));
          break;
      }
    }
  }

  private wakeWaiters(): void {
    for (const waiter of this.waiters.splice(0)) {
      if (waiter.ready(this)) {
        waiter.resolve();
      } else if (waiter.deadlineS !== undefined && this.timeS >= waiter.deadlineS) {
        waiter.onTimeout?.();
      } else {
        this.waiters.push(waiter);
      }
    }
  }

  private print(line: string): void {
    if (!this.isPlugged) return;
    for (const listener of [...this.lineListeners]) listener(line);
  }
}
