import {
  Inject,
  Injectable,
  Logger,
  type BeforeApplicationShutdown,
  type OnApplicationBootstrap,
} from '@nestjs/common';
import {
  parseScaleUrl,
  ScaleUrlError,
  type BenchSummary,
  type ScaleLinkSettings,
  type SimulatorStep,
} from '@tareline/protocol';
import { AuditRepository, type Actor } from '../audit/audit.repository.js';
import type { AuthUser } from '../auth/auth-user.js';
import { CLOCK, type Clock } from '../common/clock.js';
import { Conflict, NotAllowed, NotApplicable, NotFound } from '../common/domain-errors.js';
import { HubEvents } from '../events/hub-events.js';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { goneStatus, HubDirectory } from '../hubs/hub-directory.js';
import { ScalesService } from '../scales/scales.service.js';
import { BenchesRepository, type BenchRow, type NewBenchRow } from './benches.repository.js';

/** The bench every hub has from its first start; its scale comes from `TARELINE_SCALE`. */
export const DEFAULT_BENCH = { id: 'bench-1', name: 'Bench 1' } as const;

/** How often a hub that reads scales looks for benches no hub reads yet (several hubs). */
const CLAIM_EVERY_MS = 5_000;

/**
 * The benches and their scale links: makes sure the default bench exists, tells the scales
 * service which scale each active bench reads, and lists benches with their live scale state.
 */
@Injectable()
export class BenchesService implements OnApplicationBootstrap, BeforeApplicationShutdown {
  private readonly logger = new Logger('Benches');
  private claimTimer: NodeJS.Timeout | undefined;

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(BenchesRepository) private readonly repository: BenchesRepository,
    @Inject(ScalesService) private readonly scales: ScalesService,
    @Inject(HubEvents) private readonly events: HubEvents,
    @Inject(AuditRepository) private readonly audit: AuditRepository,
    @Inject(CLOCK) private readonly clock: Clock,
    @Inject(HubDirectory) private readonly hubs: HubDirectory,
  ) {}

  async onApplicationBootstrap(): Promise<void> {
    // A hub that reads no scale (`TARELINE_SCALE=none`) owns no bench, not even the default.
    if (!this.config.hub.readsScales) return;
    await this.add({ id: DEFAULT_BENCH.id, name: DEFAULT_BENCH.name }, null);
    await this.claimAndAttach();
    if (this.hubs.shared) {
      this.claimTimer = setInterval(() => {
        this.claimAndAttach().catch((err: unknown) =>
          this.logger.warn(`Benches not claimed: ${(err as Error).message.split('\n')[0]}`),
        );
      }, CLAIM_EVERY_MS);
    }
  }

  beforeApplicationShutdown(): void {
    clearInterval(this.claimTimer);
  }

  /**
   * Reads the scales of the benches this hub owns, taking those no hub reads yet (alone on its
   * embedded database, a hub takes every bench).
   */
  private async claimAndAttach(): Promise<void> {
    await this.repository.claim(this.config.hub.id, !this.hubs.shared);
    for (const row of await this.repository.listOwned(this.config.hub.id)) {
      if (!this.scales.has(row.id)) {
        const link = this.linkOf(row.id, row.scaleUrl);
        if (link) await this.scales.attach(row.id, link);
      }
    }
  }

  /**
   * Adds a bench unless one with its id exists, and starts reading its scale when this hub reads
   * scales (a hub that reads none leaves it to one that does).
   */
  async add(bench: NewBenchRow, by: Actor): Promise<void> {
    const hubId = this.config.hub.readsScales ? this.config.hub.id : null;
    await this.insertIfMissing({ ...bench, hubId }, by);
    const row = await this.repository.findById(bench.id);
    if (row?.active && row.hubId === this.config.hub.id && !this.scales.has(row.id)) {
      const link = this.linkOf(row.id, row.scaleUrl);
      if (link) await this.scales.attach(row.id, link);
    }
  }

  /** Adds a bench unless it exists; a new one is audited with its settings, in one transaction. */
  private async insertIfMissing(bench: NewBenchRow, by: Actor): Promise<void> {
    await this.audit.record(
      (tx) => this.repository.insertIfMissing(bench, tx),
      (created) =>
        created
          ? {
              at: new Date(this.clock.now()).toISOString(),
              actor: by,
              entity: 'bench',
              entityId: created.id,
              action: 'bench.created',
              data: {
                name: created.name,
                scaleUrl: created.scaleUrl,
                pinRequired: created.pinRequired,
                idleSignOutMin: created.idleSignOutMin,
                active: created.active,
              },
            }
          : [],
    );
  }

  /** A bench's stored URL, else the hub's default; a bad stored URL falls back loudly. */
  /**
   * A bench's stored URL, else the hub's default. A port or network scale is read by one bench
   * only (two links on one port fight over its lock, and each bench would show the other's cups):
   * the default bench's. Another bench without a usable URL of its own then reads no scale and is
   * not offered until an admin gives it one. A simulated default gives each bench its own.
   */
  private linkOf(benchId: string, scaleUrl: string | null): ScaleLinkSettings | undefined {
    const fallback = (why: string): ScaleLinkSettings | undefined => {
      const fallback = this.config.scale.link;
      if (fallback.transport === 'simulated' || benchId === DEFAULT_BENCH.id) {
        if (scaleUrl)
          this.logger.error(`${benchId}: ${why}; reading the default scale link instead`);
        return fallback;
      }
      this.logger.error(
        `${benchId}: ${why}, and the default scale is ${DEFAULT_BENCH.id}'s: this bench reads no scale until it has a URL of its own`,
      );
      return undefined;
    };
    if (!scaleUrl) return fallback('no scale URL');
    try {
      return parseScaleUrl(scaleUrl);
    } catch (err) {
      if (!(err instanceof ScaleUrlError)) throw err;
      return fallback(err.message);
    }
  }

  /** What kind of scale a bench's URL names (quietly: a remote bench's hub logs its own). */
  private transportOf(scaleUrl: string | null): ScaleLinkSettings['transport'] {
    if (!scaleUrl) return this.config.scale.link.transport;
    try {
      return parseScaleUrl(scaleUrl).transport;
    } catch {
      return this.config.scale.link.transport;
    }
  }

  async exists(benchId: string): Promise<boolean> {
    const row = await this.repository.findById(benchId);
    return (
      row !== undefined && (this.scales.has(benchId) || this.hubs.remote(benchId) !== undefined)
    );
  }

  async list(): Promise<BenchSummary[]> {
    const rows = await this.repository.listActive();
    return rows
      .filter((row) => this.scales.has(row.id) || (this.hubs.shared && row.hubId !== null))
      .map((row) => {
        if (!this.scales.has(row.id)) return this.remoteSummary(row);
        const capacityG = this.scales.capacityG(row.id);
        return {
          id: row.id,
          name: row.name,
          pinRequired: row.pinRequired,
          idleSignOutMin: row.idleSignOutMin,
          repeatabilitySdG: row.repeatabilitySdG,
          repeatabilityAt: row.repeatabilityAt?.toISOString() ?? null,
          scale: {
            ...this.scales.status(row.id),
            readabilityG: this.scales.readabilityG(row.id),
            ...(capacityG === undefined ? {} : { capacityG }),
            transport: this.scales.transport(row.id),
          },
        };
      });
  }

  /** A bench another hub reads: its scale as that hub last told, offline once it is silent. */
  private remoteSummary(row: BenchRow): BenchSummary {
    const scale = this.hubs.remoteScale(row.id) ?? {
      // Its hub has not told anything yet (it never started since it took the bench).
      ...goneStatus(row.id, row.hubId ?? '?'),
      readabilityG: 0.1,
      transport: this.transportOf(row.scaleUrl),
    };
    return {
      id: row.id,
      name: row.name,
      pinRequired: row.pinRequired,
      idleSignOutMin: row.idleSignOutMin,
      repeatabilitySdG: row.repeatabilitySdG,
      repeatabilityAt: row.repeatabilityAt?.toISOString() ?? null,
      scale,
    };
  }

  /**
   * Runs scripted steps on a simulated bench's simulator; resolves when they are done. It pours
   * and unplugs as a person at the bench would, so only someone who may work at that bench can,
   * and who did it is published (`simulator.driven`): the open batch names them.
   */
  async runSimulator(benchId: string, steps: SimulatorStep[], user: AuthUser): Promise<void> {
    if (user.role === 'operator' && user.benchId !== benchId) {
      throw new NotAllowed('Operators drive only the scale of the bench they signed in at');
    }
    if (!this.scales.has(benchId)) throw new NotFound(`There is no bench "${benchId}"`);
    const simulator = this.scales.simulator(benchId);
    if (!simulator) {
      throw new Conflict(
        `The scale of bench "${benchId}" is not simulated: there is no simulator to drive`,
      );
    }
    this.logger.log(
      `${benchId}: simulated scale driven by ${user.name} (${steps.map((s) => s.do).join(', ')})`,
    );
    this.events.emit('simulator.driven', {
      benchId,
      by: { id: user.id, name: user.name, role: user.role },
      steps,
      at: new Date().toISOString(),
    });
    try {
      await simulator.runScript(steps);
    } catch (err) {
      throw new NotApplicable(
        `The simulator script stopped: ${err instanceof Error ? err.message : String(err)}`,
      );
    }
  }
}
