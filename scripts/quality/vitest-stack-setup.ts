// Vitest globalSetup for the HTTP-level quality suites (security, fuzz): one stack (throwaway
// MariaDB with the demo seed, fakes, the production build on a free port) for the whole run,
// handed to the test files with provide(); scripts/quality/vitest-stack-env.ts copies its env.
import type { TestProject } from "vitest/node";
import { startStack } from "./stack";

declare module "vitest" {
  export interface ProvidedContext {
    stack: { env: Record<string, string>; baseURL: string; urls: string[]; mailDir: string; buildDir: string };
  }
}

export default async function setup(project: TestProject) {
  const t = Date.now();
  const stack = await startStack({ seed: true, worker: process.env.QUALITY_WORKER === "1" });
  console.log(`[quality] app ${stack.baseURL} ready in ${Date.now() - t} ms`);
  project.provide("stack", { env: stack.env, baseURL: stack.baseURL, urls: stack.urls, mailDir: stack.mailDir, buildDir: stack.buildDir });
  return async () => {
    await stack.stop();
  };
}
