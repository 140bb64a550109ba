// Playwright globalSetup: throwaway services, migrations and the demo seed, a production build in
// its own directory (a running `npm start` keeps build/), then the server on a free port and the
// worker. Everything it starts is stopped by pid in the returned teardown.
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { buildApp, startAppServer, startWorker, stopChildren, waitForHttp } from "../../scripts/lib/children";
import { runSeeds } from "../../scripts/lib/knex-ops";
import { LOCAL } from "../../scripts/lib/paths";
import { freePort } from "../../scripts/lib/ports";
import { startTestServices } from "./services";

function alive(pid: number) {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/**
 * The shared e2e build dir (kept between runs, so an unchanged app is not rebuilt), or, while
 * another live run holds it, a fresh one of our own so concurrent runs never overwrite each other.
 */
function claimBuildDir(): { dir: string; release(): void } {
  const shared = join(LOCAL, "build-e2e");
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
        /* lock being written right now */
      }
      if (owner && !alive(owner)) rmSync(lock, { recursive: true, force: true });
      else break;
    }
  }
  const own = mkdtempSync(join(LOCAL, "build-e2e-"));
  return { dir: own, release: () => rmSync(own, { recursive: true, force: true }) };
}

export default async function globalSetup() {
  const t0 = Date.now();
  const services = await startTestServices();
  const build = claimBuildDir();
  const stop = async () => {
    await stopChildren();
    await services.stop();
    build.release();
  };
  try {
    await runSeeds(services.env);
    const port = await freePort();
    const baseURL = `http://127.0.0.1:${port}`;
    const env = { ...process.env, ...services.env, HOST: "127.0.0.1", PORT: String(port), APP_URL: baseURL };
    const built = await buildApp(env, build.dir);
    const server = startAppServer(env, build.dir);
    await waitForHttp(`${baseURL}/healthz`, server);
    startWorker(env);
    // Test files read these (baseURL, waitForMail's TEST_MAIL_DIR, direct DB checks).
    Object.assign(process.env, services.env, { E2E_BASE_URL: baseURL, APP_URL: baseURL });
    console.log(`[e2e] app ${baseURL} (build ${built}) ready in ${Date.now() - t0} ms`);
  } catch (err) {
    await stop();
    throw err;
  }
  return stop;
}
