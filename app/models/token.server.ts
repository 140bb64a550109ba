import { createHash, randomBytes } from "node:crypto";
import { db as defaultDb, type Db } from "~/db.server";

export type TokenPurpose = "verify_email" | "reset_password" | "invite";

/** Lifetimes: verification and invitations 48 h, password reset 1 h (short: it grants access). */
export const TOKEN_TTL_MS: Record<TokenPurpose, number> = {
  verify_email: 48 * 3600_000,
  invite: 48 * 3600_000,
  reset_password: 3600_000,
};

const hash = (token: string) => createHash("sha256").update(token).digest("hex");

/** Creates a single-use token; only its hash is stored. */
export async function issueToken(userId: number, purpose: TokenPurpose, db: Db = defaultDb): Promise<string> {
  const token = randomBytes(32).toString("base64url");
  await db("user_tokens").insert({
    user_id: userId,
    purpose,
    token_hash: hash(token),
    expires_at: new Date(Date.now() + TOKEN_TTL_MS[purpose]),
  });
  return token;
}

/**
 * Consumes a token atomically: the UPDATE … WHERE used_at IS NULL succeeds for exactly one
 * caller, so a token cannot be used twice even by two requests at once.
 */
export async function consumeToken(token: string, purpose: TokenPurpose, db: Db = defaultDb): Promise<number | null> {
  const row = await db("user_tokens")
    .where({ token_hash: hash(token), purpose })
    .whereNull("used_at")
    .where("expires_at", ">", new Date())
    .first();
  if (!row) return null;
  const updated = await db("user_tokens").where({ id: row.id }).whereNull("used_at").update({ used_at: new Date() });
  return updated === 1 ? row.user_id : null;
}

/** Checks a token without using it (to show the form that will use it). */
export async function peekToken(token: string, purpose: TokenPurpose, db: Db = defaultDb): Promise<number | null> {
  const row = await db("user_tokens")
    .where({ token_hash: hash(token), purpose })
    .whereNull("used_at")
    .where("expires_at", ">", new Date())
    .first();
  return row ? row.user_id : null;
}
