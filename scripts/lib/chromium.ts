// Debian's Chromium for Playwright (@playwright/test 1.64 is built for Chromium 156, which Debian
// ships). `playwright install` downloads browsers and cannot work here, so we never call it.
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import { aptInstall, canUseApt } from "./apt";

export const CHROMIUM = "/usr/bin/chromium";

/** Playwright 1.64 drives Chromium 156; older builds from stale package lists misbehave. */
const MIN_MAJOR = 156;

function chromiumMajor(): number | undefined {
  if (!existsSync(CHROMIUM)) return undefined;
  const r = spawnSync(CHROMIUM, ["--version"], { encoding: "utf8", timeout: 15_000 });
  const m = /Chromium (\d+)\./.exec(r.stdout ?? "");
  return m ? Number(m[1]) : 0;
}

export function ensureChromiumInstalled(): void {
  const major = chromiumMajor();
  if (major !== undefined && (major >= MIN_MAJOR || !canUseApt())) return;
  aptInstall(
    ["chromium"],
    major === undefined ? `Chromium (${CHROMIUM}) is missing` : `Chromium ${major} is older than ${MIN_MAJOR}`,
    { current: true },
  );
  if (!existsSync(CHROMIUM)) throw new Error(`${CHROMIUM} still missing after installing chromium`);
}

/** Launch flags: no sandbox (root), and nothing that phones home or updates itself. */
export const CHROMIUM_ARGS = [
  "--no-sandbox",
  "--disable-gpu",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--no-first-run",
];
