// Playwright globalSetup: throwaway services, migrations and the demo seed, a production build in
// its own directory (a running `npm start` keeps build/), then the server on a free port and the
// worker. Everything it starts is stopped by pid in the returned teardown.
import { claimBuildDir } from "../../scripts/lib/build-dir";
import { buildApp, startAppServer, startWorker, stopChildren, waitForHttp } from "../../scripts/lib/children";
import { runSeeds } from "../../scripts/lib/knex-ops";
import { freePort } from "../../scripts/lib/ports";
import { startTestServices } from "./services";

export default async function globalSetup() {
  const t0 = Date.now();
  const services = await startTestServices();
  const build = claimBuildDir("build-e2e");
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
