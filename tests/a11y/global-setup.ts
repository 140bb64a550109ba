// Playwright globalSetup for the accessibility suite: a quality stack (throwaway MariaDB with the
// demo seed, fakes, the production build, the worker). Workers read QUALITY_BASE_URL and DB_* /
// SESSION_SECRET from process.env (they start after this). Stopped in the returned teardown.
import { startStack } from "../../scripts/quality/stack";

export default async function globalSetup() {
  const t = Date.now();
  const stack = await startStack({ seed: true, worker: true });
  Object.assign(process.env, stack.env, { QUALITY_BASE_URL: stack.baseURL });
  console.log(`[a11y] app ${stack.baseURL} ready in ${Date.now() - t} ms`);
  return async () => {
    await stack.stop();
  };
}
