import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PeopleRepository } from '../src/people/people.repository.js';
import { DemoService } from '../src/demo/demo.service.js';
import { startTestHub, tempDataDir } from './support/test-app.js';

describe('demo shop seeding', () => {
  let data: Awaited<ReturnType<typeof tempDataDir>>;

  beforeAll(async () => {
    data = await tempDataDir();
  });

  afterAll(async () => {
    await data?.remove();
  });

  it('seeds people and benches on the first start only', async () => {
    const first = await startTestHub(data.dir, {}, { template: 'none' });
    const people = await first.app.get(PeopleRepository).list();
    expect(first.app.get(DemoService).stepNames()).toEqual([
      'people',
      'benches',
      'materials and lots',
    ]);
    expect(() =>
      first.app.get(DemoService).register({ name: 'people', order: 99, run: async () => {} }),
    ).toThrow('Demo seed step "people" is registered twice');
    await first.close();
    expect(people.map((p) => p.role).sort()).toEqual([
      'admin',
      'lead',
      'operator',
      'operator',
      'operator',
    ]);
    expect(people.filter((p) => p.role === 'operator' && p.pinHash === null)).toHaveLength(1);

    const second = await startTestHub(data.dir);
    try {
      expect(await second.app.get(PeopleRepository).count()).toBe(5);
    } finally {
      await second.close();
    }
    // Two real starts of the hub, the first one migrating a new database.
  }, 90_000);
});
