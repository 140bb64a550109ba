import { readFileSync } from "node:fs";
import bcrypt from "bcryptjs";
import type { Knex } from "knex";

type DemoAccount = { email: string; password: string; role: string; name: string };

export const demoAccounts: DemoAccount[] = JSON.parse(readFileSync(new URL("./demo-accounts.json", import.meta.url), "utf8"));

export async function seed(knex: Knex) {
  // Cost 10 for demo seeding speed; real accounts use BCRYPT_COST from the user model.
  const rows = await Promise.all(
    demoAccounts.map(async (a) => ({
      email: a.email,
      name: a.name,
      role: a.role,
      password_hash: await bcrypt.hash(a.password, 10),
      email_verified_at: new Date(),
    })),
  );
  await knex("users").insert(rows);
}
