// Where things live. Everything generated at run time goes under .local/ (git-ignored).
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "../..");
export const LOCAL = join(ROOT, ".local");
export const DEMO_MARIADB_DIR = join(LOCAL, "mariadb");
