// `npm run db:seed`: runs seeds/*.ts against DB_* (defaults: the demo instance).
import { runSeeds } from "./lib/knex-ops";

const files = await runSeeds();
console.log(files.length ? `seeded: ${files.map((f) => f.split("/").pop()).join(", ")}` : "no seed files");
