// The load benchmark's lower reference for the notices API: a bare node:http listener with a
// mysql2 pool running the same two queries as GET /api/v1/notices?bbox=… (the notice page of
// app/models/notice.server.ts apiQuery(), then its parts), answering the rows as JSON. No
// framework, no validation, no formatting: what the database and Node alone cost.
// Env: DB_*, PORT, BARE_SQL (JSON { sql, bindings } from apiQuery(...).toSQL().toNative()).
import { createServer } from "node:http";
import mysql from "mysql2/promise";

const e = process.env;
const { sql, bindings } = JSON.parse(e.BARE_SQL!) as { sql: string; bindings: unknown[] };
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
    const [rows] = (await pool.query(sql, bindings)) as [Array<{ id: number }>, unknown];
    const [parts] = rows.length ? await pool.query(PARTS, [rows.map((r) => r.id)]) : [[]];
    res.writeHead(200, { "Content-Type": "application/json" }).end(JSON.stringify({ notices: rows, parts }));
  } catch (err) {
    res.writeHead(500).end(String(err));
  }
}).listen(Number(e.PORT), "127.0.0.1", () => console.log(`[bare] on ${e.PORT}`));
process.on("SIGTERM", () => process.exit(0));
