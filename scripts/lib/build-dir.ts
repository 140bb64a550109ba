// A build directory shared between test runs (an unchanged app is not rebuilt), or, while
// another live run holds it, a fresh one of the caller's own so concurrent runs never overwrite
// each other. Used by the e2e setup and the quality suites.
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { LOCAL } from "./paths";

export function alive(pid: number) {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/**
 * The shared quality build dir (kept between runs, so an unchanged app is not rebuilt), or, while
 * another live run holds it, a fresh one of our own. Same scheme as tests/support/e2e-global-setup.
 */
export function claimBuildDir(name: string): { dir: string; release(): void } {
  const shared = join(LOCAL, name);
  const lock = `${shared}.lock`;
  mkdirSync(LOCAL, { recursive: true });
  for (let attempt = 0; attempt < 2; attempt++) {
    try {
      mkdirSync(lock);
      writeFileSync(join(lock, "pid"), String(process.pid));
      return { dir: shared, release: () => rmSync(lock, { recursive: true, force: true }) };
    } catch {
      let owner = 0;
      try {
        owner = Number(readFileSync(join(lock, "pid"), "utf8"));
      } catch {
        /* being written */
      }
      if (owner && !alive(owner)) rmSync(lock, { recursive: true, force: true });
      else break;
    }
  }
  const own = mkdtempSync(join(LOCAL, `${name}-`));
  return { dir: own, release: () => rmSync(own, { recursive: true, force: true }) };
}
