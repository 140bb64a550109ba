// The validated page cache over HTTP against the production build (app/services/http-cache.server.ts
// validatedPage/memoPayload/documentCache, app/entry.server.tsx): a reused copy gets a fresh CSP
// nonce, a write or a lapse by the clock is never hidden by a copy, a signed-in reader's page
// never reaches anyone else, and a 304 carries the policy of the copy the browser holds.
import { afterAll, describe, expect, it } from "vitest";
import { closeQdb, qdb } from "../../scripts/quality/db";
import { request, type Reply } from "../../scripts/quality/http";
import { createAccount, sessionCookie } from "../../scripts/quality/people";

const base = () => process.env.QUALITY_BASE_URL!;
afterAll(closeQdb);

function cspNonce(r: Reply): string {
  const m = r.headers.get("Content-Security-Policy")?.match(/'nonce-([^']+)'/);
  if (!m) throw new Error(`no nonce in the CSP of ${r.status}`);
  return m[1]!;
}

/** Every nonce attribute in the document. */
function htmlNonces(html: string): Set<string> {
  return new Set([...html.matchAll(/ nonce="([^"]+)"/g)].map((m) => m[1]!));
}

async function inForceNotice(): Promise<{ id: number; title: string }> {
  const n = await qdb()("notices").where({ status: "in_force" }).whereNull("valid_until").orderBy("id").first("id", "title");
  if (!n) throw new Error("no notice in force until further notice in the seed");
  return n;
}

describe("validated pages", () => {
  it("reuses the board's copy with a fresh nonce in the header and in every script", async () => {
    await request(base(), "/"); // renders (or finds) the copy
    const a = await request(base(), "/");
    const b = await request(base(), "/");
    for (const r of [a, b]) {
      expect(r.status).toBe(200);
      expect(r.headers.get("X-Tidewire-Render")).toBe("cached");
      expect([...htmlNonces(r.text)]).toEqual([cspNonce(r)]);
    }
    expect(cspNonce(a)).not.toBe(cspNonce(b));
    // The same document otherwise.
    expect(a.text.replaceAll(cspNonce(a), "N")).toBe(b.text.replaceAll(cspNonce(b), "N"));
  });

  it("never answers React Router's data request for the page with the cached document", async () => {
    await request(base(), "/");
    expect((await request(base(), "/")).headers.get("X-Tidewire-Render")).toBe("cached");
    // (v8_trailingSlashAwareDataRequests: the index page's data is /_.data.) Even when the client
    // claims to be asking for the document: scripts/serve.ts overwrites that.
    const data = await request(base(), "/_.data", { headers: { "x-tidewire-request-kind": "document" } });
    expect(data.status).toBe(200);
    expect(data.headers.get("Content-Type")).toMatch(/^text\/x-script/);
    expect(data.headers.get("X-Tidewire-Render")).toBeNull();
    expect(data.text).not.toContain("<html");
  });

  it("answers 304 before any rendering, with the policy of the browser's copy", async () => {
    const first = await request(base(), "/");
    const etag = first.headers.get("ETag")!;
    expect(etag).toMatch(/^W\/"[^".]+\.[^".]+"$/);
    const again = await request(base(), "/", { headers: { "If-None-Match": etag } });
    expect(again.status).toBe(304);
    expect(again.text).toBe("");
    expect(again.headers.get("ETag")).toBe(etag);
    expect(cspNonce(again)).toBe(cspNonce(first));
  });

  it("a write to a notice changes the validator and the page at once", async () => {
    const n = await inForceNotice();
    const before = await request(base(), "/");
    expect(before.text).toContain(n.title);
    const changed = `${n.title} (amended ${Date.now()})`;
    try {
      // Straight to the table, as any path that writes notices would: the triggers see it.
      await qdb()("notices").where({ id: n.id }).update({ title: changed });
      const revalidated = await request(base(), "/", { headers: { "If-None-Match": before.headers.get("ETag")! } });
      expect(revalidated.status).toBe(200);
      expect(revalidated.text).toContain(changed);
      const page = await request(base(), `/notices/${n.id}`);
      expect(page.text).toContain(changed);
    } finally {
      await qdb()("notices").where({ id: n.id }).update({ title: n.title });
    }
    const restored = await request(base(), "/");
    expect(restored.text).toContain(n.title);
    expect(restored.text).not.toContain("(amended ");
  });

  it("the notices API: 304 from the validator, and a write shows in the next answer", async () => {
    const n = await inForceNotice();
    const first = await request(base(), "/api/v1/notices?limit=500");
    expect(first.status).toBe(200);
    const etag = first.headers.get("ETag")!;
    const again = await request(base(), "/api/v1/notices?limit=500", { headers: { "If-None-Match": etag } });
    expect(again.status).toBe(304);
    expect(again.headers.get("Access-Control-Allow-Origin")).toBe("*");
    const changed = `${n.title} (api ${Date.now()})`;
    try {
      await qdb()("notices").where({ id: n.id }).update({ title: changed });
      const after = await request(base(), "/api/v1/notices?limit=500", { headers: { "If-None-Match": etag } });
      expect(after.status).toBe(200);
      expect(after.json.features.find((f: { id: number }) => f.id === n.id).properties.title).toBe(changed);
    } finally {
      await qdb()("notices").where({ id: n.id }).update({ title: n.title });
    }
  });

  it("a notice that lapses by the clock leaves the board without any write at that moment", async () => {
    const n = await inForceNotice();
    const until = new Date(Date.now() + 2_500);
    await qdb()("notices").where({ id: n.id }).update({ valid_until: until });
    try {
      const during = await request(base(), "/");
      expect(during.text).toContain(`data-notice-id="${n.id}"`);
      await request(base(), "/"); // the copy is reused now
      await new Promise((r) => setTimeout(r, until.getTime() - Date.now() + 300));
      const after = await request(base(), "/", { headers: { "If-None-Match": during.headers.get("ETag")! } });
      expect(after.status).toBe(200);
      // Gone from the table of notices in force, listed as ended.
      const table = after.text.slice(after.text.indexOf('data-testid="notice-table"'), after.text.indexOf("</table>"));
      expect(table).not.toContain(`data-notice-id="${n.id}"`);
      expect(after.text).toContain(`data-notice-id="${n.id}"`);
    } finally {
      await qdb()("notices").where({ id: n.id }).update({ valid_until: null });
    }
  });

  it("a signed-in reader's page is private and never served to anyone else", async () => {
    const boater = await createAccount(qdb(), "boater");
    const cookie = await sessionCookie(qdb(), process.env.SESSION_SECRET!, boater.id);
    const { name } = (await qdb()("users").where({ id: boater.id }).first("name")) as { name: string };
    const mine = await request(base(), "/", { cookie });
    expect(mine.status).toBe(200);
    expect(mine.headers.get("Cache-Control")).toMatch(/^private/);
    expect(mine.headers.get("X-Tidewire-Render")).toBeNull();
    expect(mine.text).toContain(name);
    const anonymous = await request(base(), "/");
    expect(anonymous.text).not.toContain(name);
    // A shared cache must keep the two apart too: both answers vary on the cookie.
    for (const r of [mine, anonymous]) expect(r.headers.get("Vary")).toMatch(/\bCookie\b/);
    // Nor does the anonymous validator answer for the signed-in page, or the other way round.
    const cross = await request(base(), "/", { headers: { "If-None-Match": mine.headers.get("ETag")! } });
    expect(cross.status).toBe(200);
    const crossBack = await request(base(), "/", { cookie, headers: { "If-None-Match": anonymous.headers.get("ETag")! } });
    expect(crossBack.status).toBe(200);
  });
});
