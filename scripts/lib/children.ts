// Child processes we start (app server, worker, builds), tracked by pid so shutdown ends
// exactly those and nothing else.
import { spawn, type ChildProcess } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { ROOT } from "./paths";

export interface Child {
  name: string;
  proc: ChildProcess;
  /** Resolves with the exit code (or 128+signal) when the process ends. */
  exited: Promise<number>;
}

const running = new Set<Child>();

export function spawnChild(
  name: string,
  command: string,
  args: string[],
  opts: { env: NodeJS.ProcessEnv; quiet?: boolean },
): Child {
  const proc = spawn(command, args, {
    cwd: ROOT,
    env: opts.env,
    // stdin ignored: a child must never read the terminal that Ctrl-C's us.
    stdio: ["ignore", opts.quiet ? "pipe" : "inherit", opts.quiet ? "pipe" : "inherit"],
  });
  const child: Child = {
    name,
    proc,
    exited: new Promise((r) => {
      proc.on("exit", (code, signal) => {
        running.delete(child);
        r(code ?? (signal === "SIGINT" ? 130 : 143));
      });
      proc.on("error", () => {
        running.delete(child);
        r(127);
      });
    }),
  };
  running.add(child);
  return child;
}

/** Runs to completion; output is shown only when it fails (or always, with `show`). */
export async function run(name: string, command: string, args: string[], env: NodeJS.ProcessEnv, show = false) {
  const child = spawnChild(name, command, args, { env, quiet: !show });
  let out = "";
  child.proc.stdout?.on("data", (d) => (out += d));
  child.proc.stderr?.on("data", (d) => (out += d));
  const code = await child.exited;
  if (code !== 0) {
    if (!show) process.stderr.write(out);
    throw new Error(`${name} failed (exit ${code})`);
  }
}

/** SIGTERM every child still running, by pid; SIGKILL whatever is left after `graceMs`. */
export async function stopChildren(graceMs = 10_000): Promise<void> {
  const children = [...running];
  for (const c of children) if (c.proc.exitCode === null) c.proc.kill("SIGTERM");
  const timer = setTimeout(() => {
    for (const c of children) if (c.proc.exitCode === null) c.proc.kill("SIGKILL");
  }, graceMs);
  await Promise.all(children.map((c) => c.exited));
  clearTimeout(timer);
}

/** Polls `url` until it answers with any HTTP status; fails early if `child` exits. */
export async function waitForHttp(url: string, child: Child, timeoutMs = 30_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  let exited: number | undefined;
  void child.exited.then((c) => (exited = c));
  while (Date.now() < deadline) {
    if (exited !== undefined) throw new Error(`${child.name} exited (code ${exited}) before answering ${url}`);
    try {
      await fetch(url, { signal: AbortSignal.timeout(2000) });
      return;
    } catch {
      await new Promise((r) => setTimeout(r, 100));
    }
  }
  throw new Error(`${child.name} did not answer ${url} within ${timeoutMs} ms`);
}

const TSX = [`--import`, `tsx`];

/** The production server: the project's scripts/serve.ts if present, else react-router-serve. */
export function startAppServer(env: NodeJS.ProcessEnv, buildDir: string): Child {
  const e = { ...env, NODE_ENV: "production", BUILD_DIR: buildDir };
  if (existsSync(join(ROOT, "scripts/serve.ts"))) {
    return spawnChild("server", process.execPath, [...TSX, "scripts/serve.ts"], { env: e });
  }
  const bin = join(ROOT, "node_modules/@react-router/serve/bin.js");
  return spawnChild("server", process.execPath, [bin, join(buildDir, "server/index.js")], { env: e });
}

/** The background worker, when the app has one (app/worker/main.ts). */
export function startWorker(env: NodeJS.ProcessEnv): Child | undefined {
  if (!existsSync(join(ROOT, "app/worker/main.ts"))) return undefined;
  return spawnChild("worker", process.execPath, [...TSX, "app/worker/main.ts"], {
    env: { ...env, NODE_ENV: "production" },
  });
}

// What a production build depends on. A stamp of their sizes and mtimes lets a warm start skip
// an unchanged rebuild (~5 s); any edit, checkout or install changes the stamp.
const BUILD_INPUTS = ["app", "public", "react-router.config.ts", "vite.config.ts", "tsconfig.json", "package-lock.json"];

function sourceStamp(): string {
  const h = createHash("sha1");
  const walk = (p: string) => {
    if (!existsSync(p)) return;
    const st = statSync(p);
    if (st.isDirectory()) for (const f of readdirSync(p).sort()) walk(join(p, f));
    else h.update(`${p}\0${st.size}\0${st.mtimeMs}\n`);
  };
  for (const i of BUILD_INPUTS) walk(join(ROOT, i));
  return h.digest("hex");
}

/** `react-router build` into buildDir, unless a build of the same sources is already there. */
export async function buildApp(env: NodeJS.ProcessEnv, buildDir: string): Promise<"built" | "up to date"> {
  const dir = resolve(ROOT, buildDir);
  const stampFile = join(dir, ".source-stamp");
  const stamp = sourceStamp();
  if (existsSync(join(dir, "server/index.js")) && existsSync(stampFile) && readFileSync(stampFile, "utf8") === stamp) {
    return "up to date";
  }
  const bin = join(ROOT, "node_modules/@react-router/dev/bin.js");
  await run("react-router build", process.execPath, [bin, "build"], { ...env, NODE_ENV: "production", BUILD_DIR: buildDir });
  writeFileSync(stampFile, stamp);
  return "built";
}
