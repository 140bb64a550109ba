// The baseline of `npm run bench:notices`: a bare node:http listener with a mysql2 pool running
// the same statements as GET /api/v1/notices?bbox=… — the bbox step (MBRIntersects, from
// bboxIdsQuery()), the API page statement (apiQuery()'s SQL; both passed in BENCH_SQL), and the
// parts of the page — answering the rows as JSON. No framework, validation or formatting.
import { createServer } from "node:http";
import mysql from "mysql2/promise";

const e = process.env;
const { idsSql, idsBindings, sql, bindings } = JSON.parse(e.BENCH_SQL!) as { idsSql: string; idsBindings: unknown[]; sql: string; bindings: unknown[] };
const pool = mysql.createPool({ host: e.DB_HOST, port: Number(e.DB_PORT), user: e.DB_USER, password: e.DB_PASSWORD, database: e.DB_NAME, timezone: "Z", connectionLimit: 10 });
const PARTS = "select `id`, `notice_id`, `seq`, `kind`, `positions_text`, `crs`, `radius_nm`, `coordinates_json` from `notice_parts` where `notice_id` in (?) order by `notice_id`, `seq`";

createServer(async (_req, res) => {
  try {
    const [ids] = (await pool.query(idsSql, idsBindings)) as [Array<{ notice_id: number }>, unknown];
    const [rows] = ids.length ? ((await pool.query(sql, bindings)) as [Array<{ id: number }>, unknown]) : [[] as Array<{ id: number }>];
    const [parts] = rows.length ? await pool.query(PARTS, [rows.map((r) => r.id)]) : [[]];
    res.writeHead(200, { "Content-Type": "application/json" }).end(JSON.stringify({ notices: rows, parts }));
  } catch (err) {
    res.writeHead(500).end(String(err));
  }
}).listen(Number(e.PORT), "127.0.0.1", () => console.log(`[bare] on ${e.PORT}`));
process.on("SIGTERM", () => process.exit(0));
