import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { TestProject } from 'vitest/node';

declare module 'vitest' {
  export interface ProvidedContext {
    /** Where this run keeps its template data folders (made by the first worker to need one). */
    dataTemplatesDir: string;
  }
}

/**
 * Only makes the folder: the global setup cannot load the hub (it runs outside the environment
 * that resolves protocol's TypeScript source), so the first test hub that needs a template
 * makes it there, under a lock (`test-app.ts`).
 */
export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  const root = await mkdtemp(join(tmpdir(), 'tareline-templates-'));
  project.provide('dataTemplatesDir', root);
  return () => rm(root, { recursive: true, force: true });
}
