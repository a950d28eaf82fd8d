import { Inject, Injectable, Logger, type OnApplicationBootstrap } from '@nestjs/common';
import { lotInputSchema, materialInputSchema } from '@tareline/protocol';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { ADVISORY_LOCKS, Database, type Db } from '../database/database.js';
import { PeopleRepository } from '../people/people.repository.js';
import { PeopleService } from '../people/people.service.js';
import { BenchesService } from '../benches/benches.service.js';
import { MaterialsService } from '../materials/materials.service.js';
import { DEMO_BENCHES, DEMO_LOTS, DEMO_MATERIALS, DEMO_PEOPLE } from './demo-shop.js';

/** One part of the demo shop. Steps run in ascending `order`, once, on an empty database. */
export interface SeedStep {
  name: string;
  /** People are 10 and benches 20; materials and lots can take 30 and up. */
  order: number;
  run(db: Db): Promise<void>;
}

/**
 * First start: creates the first admin from TARELINE_ADMIN_EMAIL / TARELINE_ADMIN_PASSWORD, then,
 * unless TARELINE_DEMO=0, runs the registered demo seed steps. A database counts as empty when it
 * has no people; anything a step adds therefore lands once. Other modules add their demo data with
 * `demo.register({ name, order, run })` from their `onModuleInit`.
 */
@Injectable()
export class DemoService implements OnApplicationBootstrap {
  private readonly logger = new Logger('Demo');
  private readonly steps: SeedStep[] = [];

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(Database) private readonly database: Database,
    @Inject(PeopleRepository) private readonly peopleStore: PeopleRepository,
    @Inject(PeopleService) private readonly people: PeopleService,
    @Inject(BenchesService) private readonly benches: BenchesService,
    @Inject(MaterialsService) private readonly materials: MaterialsService,
  ) {
    this.register({ name: 'people', order: 10, run: () => this.seedPeople() });
    // Through the benches service, so each new bench's scale is read at once.
    this.register({
      name: 'benches',
      order: 20,
      run: async () => {
        for (const bench of DEMO_BENCHES) await this.benches.add({ ...bench }, null);
      },
    });
    this.register({ name: 'materials and lots', order: 30, run: () => this.seedMaterials() });
  }

  register(step: SeedStep): void {
    if (this.steps.some((s) => s.name === step.name)) {
      throw new Error(`Demo seed step "${step.name}" is registered twice`);
    }
    this.steps.push(step);
  }

  /** Names of the registered steps, in the order they run. */
  stepNames(): string[] {
    return this.sortedSteps().map((s) => s.name);
  }

  async onApplicationBootstrap(): Promise<void> {
    // Hubs sharing a server that start together: the first seeds, the others then find people.
    await this.database.underLock(ADVISORY_LOCKS.startup, () => this.seedIfEmpty());
  }

  private async seedIfEmpty(): Promise<void> {
    if ((await this.peopleStore.count()) > 0) return;
    const admin = this.config.auth.firstAdmin;
    if (admin) {
      await this.people.create(
        { name: 'Administrator', role: 'admin', email: admin.email, password: admin.password },
        null,
      );
      this.logger.log(`First admin created for ${admin.email}`);
    }
    if (!this.config.demo.enabled) return;
    for (const step of this.sortedSteps()) {
      await step.run(this.database.db);
      this.logger.log(`Demo shop: ${step.name} added`);
    }
  }

  private sortedSteps(): SeedStep[] {
    return [...this.steps].sort((a, b) => a.order - b.order);
  }

  private async seedPeople(): Promise<void> {
    const rows = [];
    for (const person of DEMO_PEOPLE) {
      // With a first admin from the environment, a demo e-mail could clash: skip that e-mail.
      const email =
        person.email && !(await this.peopleStore.findByEmail(person.email))
          ? person.email
          : undefined;
      rows.push(await this.people.newRow({ ...person, email }));
    }
    await this.people.createMany(rows, null);
  }

  private async seedMaterials(): Promise<void> {
    const ids = new Map<string, string>();
    for (const material of DEMO_MATERIALS) {
      const created = await this.materials.create(materialInputSchema.parse(material), null);
      ids.set(material.name, created.id);
    }
    for (const { material, ...lot } of DEMO_LOTS) {
      await this.materials.createLot(
        lotInputSchema.parse({ ...lot, materialId: ids.get(material) }),
        null,
      );
    }
  }
}
