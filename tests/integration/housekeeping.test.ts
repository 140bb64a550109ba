import { describe, expect, it } from "vitest";
import { db } from "~/db.server";
import { housekeeping } from "~/models/housekeeping.server";
import { signedInAs } from "../support/routes";

describe("housekeeping", () => {
  it("removes expired sessions, stale sign-in failures and spent rate-limit rows, and keeps live ones", async () => {
    const live = await signedInAs("boater");
    const gone = await signedInAs("boater");
    await db("sessions").where({ user_id: gone.user.id }).update({ expires_at: new Date(Date.now() - 1000) });
    await db("login_failures").insert([
      { scope: "account", key: "old@hk.example", created_at: new Date(Date.now() - 24 * 3600_000) },
      { scope: "account", key: "new@hk.example" },
    ]);
    await db("rate_limits").insert([
      { key: "report:hk-old", points: 3, expire: Date.now() - 1000 },
      { key: "report:hk-new", points: 3, expire: Date.now() + 3600_000 },
    ]);
    expect(await housekeeping()).toBeGreaterThanOrEqual(3);
    expect(await db("sessions").where({ user_id: gone.user.id })).toHaveLength(0);
    expect(await db("sessions").where({ user_id: live.user.id })).toHaveLength(1);
    expect((await db("login_failures").whereIn("key", ["old@hk.example", "new@hk.example"])).map((r) => r.key)).toEqual(["new@hk.example"]);
    expect((await db("rate_limits").where("key", "like", "report:hk-%")).map((r) => r.key)).toEqual(["report:hk-new"]);
  });
});
