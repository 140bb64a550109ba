// A knex connection to the stack's database from a test worker (set-up and assertions).
import knex, { type Knex } from "knex";

let instance: Knex | undefined;
export function qdb(env: Record<string, string | undefined> = process.env): Knex {
  instance ??= knex({
    client: "mysql2",
    connection: { host: env.DB_HOST, port: Number(env.DB_PORT), user: env.DB_USER, password: env.DB_PASSWORD, database: env.DB_NAME, timezone: "Z" },
    pool: { min: 0, max: 4 },
  });
  return instance;
}
export async function closeQdb() {
  await instance?.destroy();
  instance = undefined;
}
