// Installs Debian packages when a needed program is missing. Only as root on Debian: anywhere
// else we stop with a message saying what to install, rather than guessing a package manager.
import { spawnSync } from "node:child_process";
import { accessSync, constants, existsSync, readdirSync, statSync } from "node:fs";
import { delimiter, join } from "node:path";

/** Absolute path of the first candidate that exists, or the first match on PATH. */
export function findProgram(name: string, candidates: string[] = []): string | undefined {
  for (const c of candidates) if (existsSync(c)) return c;
  for (const dir of (process.env.PATH ?? "").split(delimiter)) {
    if (!dir) continue;
    const p = join(dir, name);
    try {
      accessSync(p, constants.X_OK);
      return p;
    } catch {
      /* not here */
    }
  }
  return undefined;
}

function aptGet(args: string[]): boolean {
  const r = spawnSync("apt-get", args, {
    stdio: "inherit",
    env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" },
  });
  return r.status === 0;
}

export function canUseApt(): boolean {
  return process.getuid?.() === 0 && existsSync("/etc/debian_version") && !!findProgram("apt-get");
}

const LISTS = "/var/lib/apt/lists";

/** Lists missing the security suite, or older than a week, would install outdated versions. */
function listsStale(): boolean {
  try {
    const files = readdirSync(LISTS).filter((f) => f.endsWith("InRelease") || f.endsWith("_Release"));
    if (!files.some((f) => f.includes("security"))) return true;
    const newest = Math.max(...files.map((f) => statSync(`${LISTS}/${f}`).mtimeMs));
    return Date.now() - newest > 7 * 24 * 3600 * 1000;
  } catch {
    return true;
  }
}

/**
 * `apt-get install` the packages. `apt-get update` runs only when the first attempt fails
 * (package lists missing), or first when `current` is asked for and the lists are stale —
 * e.g. Chromium, whose version must match what Playwright was built for.
 */
export function aptInstall(packages: string[], why: string, opts: { current?: boolean } = {}): void {
  if (!canUseApt()) {
    throw new Error(
      `${why}: install the Debian/Ubuntu packages ${packages.join(" ")} (needs root), then retry.`,
    );
  }
  console.log(`[apt] ${why}: installing ${packages.join(" ")}`);
  const args = ["install", "-y", "--no-install-recommends", ...packages];
  if (opts.current && listsStale()) {
    console.log("[apt] package lists are stale: apt-get update");
    aptGet(["update"]);
  }
  if (aptGet(args)) return;
  console.log("[apt] install failed; refreshing package lists and retrying");
  if (!aptGet(["update"]) || !aptGet(args)) {
    throw new Error(`apt-get could not install ${packages.join(" ")}`);
  }
}
