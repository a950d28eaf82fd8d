import { resolve } from 'node:path';
import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';

// The repository root, where eslint.config.js lives.
const root = resolve(import.meta.dirname, '../..');
const eslint = new ESLint({ cwd: root });

/** The rules that fired on a piece of code as if it stood at `filePath` (from the repo root). */
async function rulesFired(code: string, filePath: string): Promise<(string | null)[]> {
  const [result] = await eslint.lintText(code, { filePath });
  return result!.messages.map((m) => m.ruleId);
}

describe('the station layer rules', () => {
  it('reports a shared component that imports a feature', async () => {
    const code = [
      "import { HubStatus } from '../../features/health/components/hub-status';",
      'export const Probe = () => <HubStatus />;',
    ].join('\n');
    expect(await rulesFired(code, 'station/src/components/layout/probe.tsx')).toContain(
      'import-x/no-restricted-paths',
    );
  });

  it('reports a feature that imports another feature', async () => {
    const code = [
      "import { VolumeEstimator } from '../../plan/components/volume-estimator';",
      'export const Probe = () => <VolumeEstimator />;',
    ].join('\n');
    expect(await rulesFired(code, 'station/src/features/batch/components/probe.tsx')).toContain(
      'import-x/no-restricted-paths',
    );
  });

  it('lets a feature use shared code and its own parts', async () => {
    const code = [
      "import { Gauge } from '../../../components/gauge/gauge';",
      "import { useLots } from '../api/get-lots';",
      'export const Probe = () => <Gauge status={useLots() as never} />;',
    ].join('\n');
    expect(await rulesFired(code, 'station/src/features/batch/components/probe.tsx')).toEqual([]);
  });
});
