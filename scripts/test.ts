// `npm test`: typecheck, Vitest (unit + integration, real MariaDB and fakes), Playwright (Debian
// Chromium). Each suite streams its usual output and writes a JSON report that we sum; the last
// line is always `tests: N passed, N failed, N skipped`. A suite that crashes (no report, or an
// error outside any test) counts as one failure, so a broken setup can never look green.
import { spawn } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { ensureChromiumInstalled } from "./lib/chromium";
import { ensureMariadbInstalled } from "./lib/mariadb";
import { ROOT } from "./lib/paths";

interface Tally {
  passed: number;
  failed: number;
  skipped: number;
}
const total: Tally = { passed: 0, failed: 0, skipped: 0 };
const timings: string[] = [];
const reports = mkdtempSync(join(tmpdir(), "tidewire-test-reports-"));

function exec(command: string, args: string[], env: NodeJS.ProcessEnv = process.env): Promise<number> {
  return new Promise((resolve) => {
    const child = spawn(command, args, { cwd: ROOT, env, stdio: ["ignore", "inherit", "inherit"] });
    // Ctrl-C reaches the child through the terminal too; we only need to not die first.
    const forward = () => undefined;
    process.on("SIGINT", forward);
    child.on("exit", (code, signal) => {
      process.off("SIGINT", forward);
      resolve(code ?? (signal ? 1 : 0));
    });
    child.on("error", () => resolve(127));
  });
}

const bin = (pkg: string, file: string) => join(ROOT, "node_modules", pkg, file);

async function suite(name: string, fn: () => Promise<Tally>) {
  console.log(`\n=== ${name} ===`);
  const t = Date.now();
  let r: Tally;
  try {
    r = await fn();
  } catch (err) {
    console.error(`[test] ${name} crashed: ${(err as Error).message}`);
    r = { passed: 0, failed: 1, skipped: 0 };
  }
  total.passed += r.passed;
  total.failed += r.failed;
  total.skipped += r.skipped;
  const s = ((Date.now() - t) / 1000).toFixed(1);
  timings.push(`${name} ${s} s`);
  console.log(`=== ${name}: ${r.passed} passed, ${r.failed} failed, ${r.skipped} skipped (${s} s) ===`);
}

function readJson<T>(file: string): T | undefined {
  try {
    return JSON.parse(readFileSync(file, "utf8")) as T;
  } catch {
    return undefined;
  }
}

const t0 = Date.now();
try {
  await suite("setup", async () => {
    ensureChromiumInstalled();
    ensureMariadbInstalled();
    return { passed: 0, failed: 0, skipped: 0 };
  });

  // The whole typecheck counts as one test.
  await suite("typecheck", async () => {
    const ok =
      (await exec(process.execPath, [bin("@react-router/dev", "bin.js"), "typegen"])) === 0 &&
      (await exec(process.execPath, [bin("typescript", "bin/tsc"), "--noEmit"])) === 0;
    return { passed: ok ? 1 : 0, failed: ok ? 0 : 1, skipped: 0 };
  });

  await suite("vitest (unit + integration)", async () => {
    const out = join(reports, "vitest.json");
    const code = await exec(process.execPath, [
      bin("vitest", "vitest.mjs"),
      "run",
      "--passWithNoTests",
      "--reporter=default",
      "--reporter=json",
      `--outputFile.json=${out}`,
    ]);
    const r = readJson<{
      numPassedTests: number;
      numFailedTests: number;
      numPendingTests: number;
      numTodoTests: number;
    }>(out);
    if (!r) throw new Error(`no report (exit ${code})`);
    const tally = {
      passed: r.numPassedTests,
      failed: r.numFailedTests,
      skipped: r.numPendingTests + r.numTodoTests,
    };
    // Exit code 1 with no failed test: an unhandled error, a failed globalSetup, a bad file.
    if (code !== 0 && tally.failed === 0) tally.failed = 1;
    return tally;
  });

  await suite("playwright (e2e)", async () => {
    const out = join(reports, "playwright.json");
    const code = await exec(
      process.execPath,
      [bin("@playwright/test", "cli.js"), "test", "--pass-with-no-tests", "--reporter=list,json"],
      { ...process.env, PLAYWRIGHT_JSON_OUTPUT_NAME: out },
    );
    const r = readJson<{
      stats: { expected: number; unexpected: number; flaky: number; skipped: number };
      errors: unknown[];
    }>(out);
    if (!r) throw new Error(`no report (exit ${code})`);
    const tally = {
      passed: r.stats.expected + r.stats.flaky,
      failed: r.stats.unexpected,
      skipped: r.stats.skipped,
    };
    // Errors outside tests (global setup, a file that does not load) are failures too.
    if ((code !== 0 || r.errors.length > 0) && tally.failed === 0) tally.failed = 1;
    return tally;
  });
  // Quality suites (issue 7), fast parts: QUALITY_FAST=1 keeps fuzzing short, skips the wapiti
  // scan and checks a representative set of pages with axe. Long runs: npm run test:security,
  // test:fuzz, test:faults, test:a11y, bench:load, bench:lighthouse.
  const fastEnv = { ...process.env, QUALITY_FAST: "1", FUZZ_RUNS: process.env.FUZZ_RUNS ?? "4" };
  for (const q of ["security", "fuzz", "faults"]) {
    await suite(`quality: ${q} (vitest, fast)`, async () => {
      const out = join(reports, `quality-${q}.json`);
      const code = await exec(
        process.execPath,
        [bin("vitest", "vitest.mjs"), "run", "--config", `tests/${q}/vitest.config.ts`, "--reporter=default", "--reporter=json", `--outputFile.json=${out}`],
        fastEnv,
      );
      const r = readJson<{ numPassedTests: number; numFailedTests: number; numPendingTests: number; numTodoTests: number }>(out);
      if (!r) throw new Error(`no report (exit ${code})`);
      const tally = { passed: r.numPassedTests, failed: r.numFailedTests, skipped: r.numPendingTests + r.numTodoTests };
      if (code !== 0 && tally.failed === 0) tally.failed = 1;
      return tally;
    });
  }
  await suite("quality: a11y (playwright, fast)", async () => {
    const out = join(reports, "quality-a11y.json");
    const code = await exec(process.execPath, [bin("@playwright/test", "cli.js"), "test", "--config", "tests/a11y/playwright.config.ts", "--reporter=list,json"], {
      ...fastEnv,
      PLAYWRIGHT_JSON_OUTPUT_NAME: out,
    });
    const r = readJson<{ stats: { expected: number; unexpected: number; flaky: number; skipped: number }; errors: unknown[] }>(out);
    if (!r) throw new Error(`no report (exit ${code})`);
    const tally = { passed: r.stats.expected + r.stats.flaky, failed: r.stats.unexpected, skipped: r.stats.skipped };
    if ((code !== 0 || r.errors.length > 0) && tally.failed === 0) tally.failed = 1;
    return tally;
  });
} finally {
  rmSync(reports, { recursive: true, force: true });
}

console.log(`\nTimings: ${timings.join(", ")}; total ${((Date.now() - t0) / 1000).toFixed(1)} s`);
console.log(`tests: ${total.passed} passed, ${total.failed} failed, ${total.skipped} skipped`);
process.exitCode = total.failed > 0 ? 1 : 0;
