// A small in-process load generator for fault tests: a few concurrent loops, each requesting its
// target over and over and recording every reply (status, type, a slice of the body) or error,
// with the time it was sent. Figures for speed come from wrk (scripts/bench-load.ts), not this.
import { request } from "./http";

export interface Target {
  name: string;
  path: string | (() => string);
  method?: string;
  cookie?: string;
  form?: () => Record<string, string>;
  json?: () => unknown;
}

export interface Sample {
  target: string;
  path: string;
  startedAt: number;
  status: number; // 0 = the request itself failed (connection refused / reset / timeout)
  contentType: string;
  retryAfter: string | null;
  body: string;
  error?: string;
  form?: Record<string, string>;
}

export function startLoad(base: string, targets: Target[], loopsPerTarget = 2) {
  const samples: Sample[] = [];
  let running = true;
  const loop = async (t: Target) => {
    while (running) {
      const path = typeof t.path === "function" ? t.path() : t.path;
      const form = t.form?.();
      const startedAt = Date.now();
      try {
        const r = await request(base, path, { method: t.method, cookie: t.cookie, form, json: t.json?.(), timeoutMs: 15_000 });
        samples.push({ target: t.name, path, startedAt, status: r.status, contentType: r.headers.get("content-type") ?? "", retryAfter: r.headers.get("retry-after"), body: r.text.slice(0, 64_000), form });
      } catch (e) {
        samples.push({ target: t.name, path, startedAt, status: 0, contentType: "", retryAfter: null, body: "", error: String((e as Error).cause ?? e), form });
        await new Promise((r) => setTimeout(r, 20));
      }
    }
  };
  const loops = targets.flatMap((t) => Array.from({ length: loopsPerTarget }, () => loop(t)));
  return {
    samples,
    async stop() {
      running = false;
      await Promise.all(loops);
      return samples;
    },
  };
}

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Polls `fn` until it returns a truthy value; throws with `what` after timeoutMs. */
export async function until<T>(what: string, fn: () => Promise<T> | T, timeoutMs = 30_000, everyMs = 100): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  let last: unknown;
  for (;;) {
    try {
      const v = await fn();
      if (v) return v;
    } catch (e) {
      last = e;
    }
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}${last ? `: ${String(last)}` : ""}`);
    await sleep(everyMs);
  }
}

export function tally(samples: Sample[]): string {
  const by = new Map<string, number>();
  for (const s of samples) by.set(`${s.target} ${s.status}`, (by.get(`${s.target} ${s.status}`) ?? 0) + 1);
  return [...by].sort().map(([k, n]) => `${k}: ${n}`).join(", ");
}
