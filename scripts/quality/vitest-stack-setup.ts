// Vitest globalSetup for the HTTP-level quality suites (security, fuzz): one stack (throwaway
// MariaDB with the demo seed, fakes, the production build on a free port) for the whole run,
// handed to the test files with provide(); scripts/quality/vitest-stack-env.ts copies its env.
import { readFileSync } from "node:fs";
import type { TestProject } from "vitest/node";
import { startStack } from "./stack";

declare module "vitest" {
  export interface ProvidedContext {
    stack: { env: Record<string, string>; baseURL: string; urls: string[]; mailDir: string; buildDir: string };
  }
}

export default async function setup(project: TestProject) {
  // Development aid: QUALITY_STACK_FILE names a JSON file ({ url, env }) of a stack already
  // running (scripts/quality/up.ts), so a suite can be re-run without building again.
  if (process.env.QUALITY_STACK_FILE) {
    const s = JSON.parse(readFileSync(process.env.QUALITY_STACK_FILE, "utf8")) as { url: string; env: Record<string, string> };
    project.provide("stack", { env: s.env, baseURL: s.url, urls: [s.url], mailDir: s.env.TEST_MAIL_DIR, buildDir: "" });
    return;
  }
  const t = Date.now();
  const stack = await startStack({ seed: true, worker: process.env.QUALITY_WORKER === "1" });
  console.log(`[quality] app ${stack.baseURL} ready in ${Date.now() - t} ms`);
  project.provide("stack", { env: stack.env, baseURL: stack.baseURL, urls: stack.urls, mailDir: stack.mailDir, buildDir: stack.buildDir });
  return async () => {
    await stack.stop();
  };
}
