import type { TestProject } from 'vitest/node';
import dataTemplates from './global-setup.js';
import { startPgCluster } from './pg-cluster.js';

declare module 'vitest' {
  export interface ProvidedContext {
    /** The throwaway server's maintenance database; each test hub gets a database of its own. */
    pgAdminUrl: string;
  }
}

/** The PostgreSQL suite: a throwaway server for the run, stopped (and its folder removed) after. */
export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  const cluster = await startPgCluster();
  project.provide('pgAdminUrl', cluster.adminUrl);
  const removeTemplates = await dataTemplates(project);
  return async () => {
    await removeTemplates();
    cluster.stop();
  };
}
