// The load benchmark's lower reference for the notices API: a bare node:http listener with a
// mysql2 pool running the same statements as GET /api/v1/notices?bbox=… (from
// app/models/notice.server.ts: the bbox step bboxIdsQuery(), the page apiQuery(), then the
// parts of the page's notices), answering the rows as JSON. No framework, no validation, no
// formatting: what the database and Node alone cost. The page statement is prepared once with
// the bbox step's ids (the benchmark's data does not change while it runs).
// Env: DB_*, PORT, BARE_SQL (JSON [{ sql, bindings }, …] from knex .toSQL().toNative()).
import { createServer } from "node:http";
import mysql from "mysql2/promise";

const e = process.env;
const statements = JSON.parse(e.BARE_SQL!) as Array<{ sql: string; bindings: unknown[] }>;
const pool = mysql.createPool({
  host: e.DB_HOST,
  port: Number(e.DB_PORT),
  user: e.DB_USER,
  password: e.DB_PASSWORD,
  database: e.DB_NAME,
  timezone: "Z",
  connectionLimit: Number(e.DB_POOL_MAX ?? 10),
});
const PARTS = "select `id`, `notice_id`, `seq`, `kind`, `positions_text`, `crs`, `radius_nm`, `coordinates_json` from `notice_parts` where `notice_id` in (?) order by `notice_id`, `seq`";

createServer(async (_req, res) => {
  try {
    let rows: Array<{ id: number }> = [];
    for (const st of statements) [rows] = (await pool.query(st.sql, st.bindings)) as [Array<{ id: number }>, unknown];
    const [parts] = rows.length ? await pool.query(PARTS, [rows.map((r) => r.id)]) : [[]];
    res.writeHead(200, { "Content-Type": "application/json" }).end(JSON.stringify({ notices: rows, parts }));
  } catch (err) {
    res.writeHead(500).end(String(err));
  }
}).listen(Number(e.PORT), "127.0.0.1", () => console.log(`[bare] on ${e.PORT}`));
process.on("SIGTERM", () => process.exit(0));
