// Vitest globalSetup for the integration project: starts the throwaway services once per run
// (in the main process) and hands their env to the test workers with provide(); the setup file
// tests/support/vitest-worker-env.ts copies it into process.env before any test file (and so
// the app's env.server.ts) is imported. provide/inject is used rather than mutating
// process.env here because workers are not guaranteed to be spawned after this runs.
import type { TestProject } from "vitest/node";
import { startTestServices } from "./services";

declare module "vitest" {
  export interface ProvidedContext {
    serviceEnv: Record<string, string>;
  }
}

export default async function setup(project: TestProject) {
  const services = await startTestServices();
  const t = services.timingsMs;
  console.log(`[test services] mariadb ${t.mariadb} ms, fakes ${t.fakes} ms, migrations ${t.migrations} ms`);
  project.provide("serviceEnv", services.env);
  return async () => {
    await services.stop();
  };
}
