// `npm run bench:lighthouse [-- --runs 3 --preset mobile|desktop]`: Lighthouse 12 (Debian's
// Chromium through chrome-launcher) on the board and a notice page of the production build
// (demo data, throwaway services). Accessibility and best-practices scores repeat run to run;
// performance moves with machine load, so each page is run three times and the median taken.
// Goals: accessibility 100, best practices ≥ 95, performance ≥ 90. Exit 1 when one is missed.
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { parseArgs } from "node:util";
import * as chromeLauncher from "chrome-launcher";
import lighthouse from "lighthouse";
import { CHROMIUM, CHROMIUM_ARGS, ensureChromiumInstalled } from "../lib/chromium";
import { LOCAL } from "../lib/paths";
import { startStack } from "./stack";

const { values: flags } = parseArgs({ options: { runs: { type: "string", default: "3" }, preset: { type: "string", default: "mobile" } } });
const RUNS = Number(flags.runs);
const GOALS = { accessibility: 100, "best-practices": 95, performance: 90 } as const;
type Category = keyof typeof GOALS;

ensureChromiumInstalled();
const out = join(LOCAL, "lighthouse");
mkdirSync(out, { recursive: true });
const stack = await startStack({ seed: true });
const chrome = await chromeLauncher.launch({
  chromePath: CHROMIUM,
  chromeFlags: [...CHROMIUM_ARGS, "--headless=new"],
  envVars: { ...process.env, XDG_CONFIG_HOME: join(LOCAL, "xdg", "config"), XDG_CACHE_HOME: join(LOCAL, "xdg", "cache") } as Record<string, string>,
});
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
let ok = true;
const lines: string[] = [];
try {
  const notice = (await stack.db("notices").where({ status: "in_force" }).orderBy("id").first("id")) as { id: number } | undefined;
  const pages: Array<[string, string]> = [["board", "/"], ...(notice ? ([["notice page", `/notices/${notice.id}`]] as Array<[string, string]>) : [])];
  if (!notice) {
    ok = false;
    lines.push("no notice in force in the demo data: notice page not measured");
  }
  for (const [name, path] of pages) {
    const scores: Record<Category, number[]> = { accessibility: [], "best-practices": [], performance: [] };
    const audits: string[] = [];
    for (let i = 0; i < RUNS; i++) {
      const r = await lighthouse(
        stack.baseURL + path,
        { port: chrome.port, output: "json", logLevel: "error", onlyCategories: Object.keys(GOALS) },
        flags.preset === "desktop" ? { extends: "lighthouse:default", settings: { formFactor: "desktop", screenEmulation: { mobile: false, width: 1350, height: 940, deviceScaleFactor: 1, disabled: false }, throttling: { rttMs: 40, throughputKbps: 10240, cpuSlowdownMultiplier: 1, requestLatencyMs: 0, downloadThroughputKbps: 0, uploadThroughputKbps: 0 } } } : undefined,
      );
      if (!r) throw new Error(`lighthouse returned nothing for ${path}`);
      writeFileSync(join(out, `${name.replace(/\s+/g, "-")}-${i + 1}.json`), typeof r.report === "string" ? r.report : JSON.stringify(r.lhr));
      for (const c of Object.keys(GOALS) as Category[]) scores[c].push(Math.round((r.lhr.categories[c]?.score ?? 0) * 100));
      if (i === 0) {
        for (const a of Object.values(r.lhr.audits)) {
          if (a.score !== null && a.score < 1 && (a.scoreDisplayMode === "binary" || a.scoreDisplayMode === "metricSavings" || a.scoreDisplayMode === "numeric")) audits.push(`${a.id}: ${a.displayValue ?? a.score}`);
        }
      }
    }
    const med = Object.fromEntries((Object.keys(GOALS) as Category[]).map((c) => [c, median(scores[c])])) as Record<Category, number>;
    const verdict = (Object.keys(GOALS) as Category[]).map((c) => `${c} ${med[c]} (runs ${scores[c].join("/")}, goal ${c === "accessibility" ? "" : "≥ "}${GOALS[c]}) ${med[c] >= GOALS[c] ? "met" : "NOT MET"}`);
    for (const c of Object.keys(GOALS) as Category[]) if (med[c] < GOALS[c]) ok = false;
    lines.push(`${name} ${path} [${flags.preset}]: ${verdict.join("; ")}`);
    if (audits.length) lines.push(`  audits below full score: ${audits.slice(0, 12).join("; ")}`);
  }
} finally {
  await chrome.kill();
  await stack.stop();
}
for (const l of lines) console.log(`[lighthouse] ${l}`);
writeFileSync(join(LOCAL, "lighthouse.md"), lines.join("\n") + "\n");
process.exitCode = ok ? 0 : 1;
