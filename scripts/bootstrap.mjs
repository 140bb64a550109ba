// Entry point for `npm start` and `npm test`. Plain Node with no dependencies, because on a
// fresh clone node_modules (and so tsx) may not exist yet.
import { spawn, spawnSync } from "node:child_process";
import { existsSync, statSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

const root = join(dirname(fileURLToPath(import.meta.url)), "..");
const commands = { start: "scripts/start.ts", test: "scripts/test.ts", dev: "scripts/dev.ts" };
const command = process.argv[2];
if (!commands[command]) {
  console.error(`usage: node scripts/bootstrap.mjs ${Object.keys(commands).join("|")}`);
  process.exit(2);
}

// npm writes node_modules/.package-lock.json on every install; if the lock file is newer,
// someone changed dependencies since the last install.
function needsInstall() {
  const marker = join(root, "node_modules", ".package-lock.json");
  if (!existsSync(marker)) return true;
  return statSync(join(root, "package-lock.json")).mtimeMs > statSync(marker).mtimeMs;
}

if (needsInstall()) {
  console.log("[bootstrap] installing dependencies (npm ci)…");
  const t0 = Date.now();
  const npm = process.platform === "win32" ? "npm.cmd" : "npm";
  const r = spawnSync(npm, ["ci"], { cwd: root, stdio: "inherit" });
  if (r.status !== 0) {
    console.error("[bootstrap] npm ci failed");
    process.exit(r.status ?? 1);
  }
  console.log(`[bootstrap] npm ci done in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
}

const child = spawn(
  process.execPath,
  ["--import", "tsx", commands[command], ...process.argv.slice(3)],
  { cwd: root, stdio: "inherit" },
);
// The terminal sends Ctrl-C to the whole foreground group; forwarding covers the case where
// only this process is signalled (e.g. `kill <pid>`). The child handles the shutdown itself.
for (const sig of ["SIGINT", "SIGTERM", "SIGHUP"]) {
  process.on(sig, () => child.kill(sig));
}
child.on("exit", (code, signal) => {
  process.exit(code ?? (signal ? 128 + (signal === "SIGINT" ? 2 : 15) : 1));
});
