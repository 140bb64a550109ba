// The aids-to-navigation register: data access as small named functions (optional db/trx).
import type { Knex } from "knex";
import { db as defaultDb, type Db } from "~/db.server";
import type { AidStatus, AidType, IalaCategory } from "~/lib/aids/iala";
import { parseLightCharacteristic, type LightCharacteristic } from "~/lib/aids/light";
import { swingRadiusOf, type NormalisedAid } from "~/lib/aids/schema";

export type Aid = {
  id: number;
  harbourId: number;
  code: string;
  name: string;
  aidType: AidType;
  ialaCategory: IalaCategory | null;
  ialaRegion: "A" | "B";
  lightCharacteristic: string | null;
  chartedPositionText: string;
  chartedCrs: string;
  lat: number;
  lon: number;
  chainLengthM: number | null;
  depthM: number | null;
  swingRadiusM: number | null;
  status: AidStatus;
  remarks: string | null;
  updatedAt: Date;
};

type Row = {
  id: number;
  harbour_id: number;
  code: string;
  name: string;
  aid_type: AidType;
  iala_category: IalaCategory | null;
  iala_region: "A" | "B";
  light_characteristic: string | null;
  charted_position_text: string;
  charted_crs: string;
  lat: number;
  lon: number;
  chain_length_m: string | number | null;
  depth_m: string | number | null;
  swing_radius_m: string | number | null;
  status: AidStatus;
  remarks: string | null;
  updated_at: Date;
};

const num = (v: string | number | null) => (v === null || v === undefined ? null : Number(v));

function toAid(r: Row): Aid {
  return {
    id: r.id,
    harbourId: r.harbour_id,
    code: r.code,
    name: r.name,
    aidType: r.aid_type,
    ialaCategory: r.iala_category,
    ialaRegion: r.iala_region,
    lightCharacteristic: r.light_characteristic,
    chartedPositionText: r.charted_position_text,
    chartedCrs: r.charted_crs,
    lat: Number(r.lat),
    lon: Number(r.lon),
    chainLengthM: num(r.chain_length_m),
    depthM: num(r.depth_m),
    swingRadiusM: num(r.swing_radius_m),
    status: r.status,
    remarks: r.remarks,
    updatedAt: r.updated_at,
  };
}

const COLUMNS = [
  "id",
  "harbour_id",
  "code",
  "name",
  "aid_type",
  "iala_category",
  "iala_region",
  "light_characteristic",
  "charted_position_text",
  "charted_crs",
  "lat",
  "lon",
  "chain_length_m",
  "depth_m",
  "swing_radius_m",
  "status",
  "remarks",
  "updated_at",
];

/** Runs `fn` in the caller's transaction, or in a new one. */
export async function withTransaction<T>(db: Db, fn: (trx: Knex.Transaction) => Promise<T>): Promise<T> {
  if ((db as Knex.Transaction).isTransaction === true) return fn(db as Knex.Transaction);
  return (db as Knex).transaction(fn);
}

export function aidSwingRadiusM(a: Aid): number | null {
  return swingRadiusOf(a);
}

export function aidLight(a: Aid): LightCharacteristic | null {
  if (!a.lightCharacteristic) return null;
  const r = parseLightCharacteristic(a.lightCharacteristic);
  return r.ok ? r.value : null;
}

export async function listAids(harbourId: number, opts: { includeWithdrawn?: boolean } = {}, db: Db = defaultDb): Promise<Aid[]> {
  const q = db("aids").select(COLUMNS).where({ harbour_id: harbourId }).orderBy("code");
  if (!opts.includeWithdrawn) q.whereNot({ status: "withdrawn" });
  return ((await q) as Row[]).map(toAid);
}

export async function getAid(id: number, db: Db = defaultDb): Promise<Aid | null> {
  const r = (await db("aids").select(COLUMNS).where({ id }).first()) as Row | undefined;
  return r ? toAid(r) : null;
}

export async function getAidByCode(harbourId: number, code: string, db: Db = defaultDb): Promise<Aid | null> {
  const r = (await db("aids").select(COLUMNS).where({ harbour_id: harbourId, code }).first()) as Row | undefined;
  return r ? toAid(r) : null;
}

function rowOf(a: NormalisedAid, db: Db) {
  return {
    code: a.code,
    name: a.name,
    aid_type: a.aidType,
    iala_category: a.ialaCategory,
    iala_region: a.ialaRegion,
    light_characteristic: a.lightCharacteristic,
    charted_position_text: a.chartedPositionText,
    charted_crs: a.chartedCrs,
    lat: a.lat,
    lon: a.lon,
    geom: db.raw("ST_GeomFromText(?, 4326)", [`POINT(${a.lon} ${a.lat})`]),
    chain_length_m: a.chainLengthM,
    depth_m: a.depthM,
    swing_radius_m: a.swingRadiusM,
    remarks: a.remarks,
  };
}

export class AidCodeTakenError extends Error {
  constructor(code: string) {
    super(`Another aid already has the code ${code}`);
  }
}

export async function createAid(harbourId: number, a: NormalisedAid, userId: number | null, db: Db = defaultDb): Promise<number> {
  const run = async (trx: Db) => {
    if (await getAidByCode(harbourId, a.code, trx)) throw new AidCodeTakenError(a.code);
    const [id] = await trx("aids").insert({ harbour_id: harbourId, ...rowOf(a, trx), status: a.status });
    await trx("aid_status_history").insert({ aid_id: id, from_status: null, to_status: a.status, reason: "Entered in the register", changed_by: userId });
    return id as number;
  };
  return withTransaction(db, run);
}

/** Updates the register entry; a status change (if any) goes through setAidStatus with history. */
export async function updateAid(id: number, a: NormalisedAid, userId: number | null, reason: string | null, db: Db = defaultDb): Promise<void> {
  const run = async (trx: Db) => {
    const current = await getAid(id, trx);
    if (!current) throw new Error(`aid ${id} not found`);
    const other = await getAidByCode(current.harbourId, a.code, trx);
    if (other && other.id !== id) throw new AidCodeTakenError(a.code);
    await trx("aids").where({ id }).update({ ...rowOf(a, trx), updated_at: trx.fn.now(3) });
    if (a.status !== current.status) await setAidStatus(id, a.status, { reason: reason ?? "Register edited", userId }, trx);
  };
  return withTransaction(db, run);
}

/** Changes an aid's status and records it; call inside the transaction of the cause. */
export async function setAidStatus(
  aidId: number,
  status: AidStatus,
  by: { reason?: string | null; userId?: number | null; reportId?: number | null },
  trx: Db,
): Promise<boolean> {
  const row = (await trx("aids").select("status").where({ id: aidId }).forUpdate().first()) as { status: AidStatus } | undefined;
  if (!row) throw new Error(`aid ${aidId} not found`);
  if (row.status === status) return false;
  await trx("aids").where({ id: aidId }).update({ status, updated_at: trx.fn.now(3) });
  await trx("aid_status_history").insert({
    aid_id: aidId,
    from_status: row.status,
    to_status: status,
    reason: by.reason?.slice(0, 500) ?? null,
    report_id: by.reportId ?? null,
    changed_by: by.userId ?? null,
  });
  return true;
}

export type AidStatusChange = {
  id: number;
  fromStatus: AidStatus | null;
  toStatus: AidStatus;
  reason: string | null;
  reportId: number | null;
  changedByName: string | null;
  changedAt: Date;
};

export async function aidStatusHistory(aidId: number, db: Db = defaultDb): Promise<AidStatusChange[]> {
  const rows = await db("aid_status_history as h")
    .leftJoin("users as u", "u.id", "h.changed_by")
    .select("h.id", "h.from_status", "h.to_status", "h.reason", "h.report_id", "u.name as changed_by_name", "h.changed_at")
    .where("h.aid_id", aidId)
    .orderBy([{ column: "h.changed_at", order: "desc" }, { column: "h.id", order: "desc" }]);
  return rows.map((r: Record<string, unknown>) => ({
    id: r.id as number,
    fromStatus: r.from_status as AidStatus | null,
    toStatus: r.to_status as AidStatus,
    reason: r.reason as string | null,
    reportId: r.report_id as number | null,
    changedByName: r.changed_by_name as string | null,
    changedAt: r.changed_at as Date,
  }));
}

export type ImportPlan = { code: string; action: "create" | "update"; aidId?: number }[];

/** What an import would do, row by row (existing codes are updated, new ones created). */
export async function planImport(harbourId: number, rows: NormalisedAid[], db: Db = defaultDb): Promise<ImportPlan> {
  const existing = (await db("aids").select("id", "code").where({ harbour_id: harbourId })) as { id: number; code: string }[];
  const byCode = new Map(existing.map((e) => [e.code.toUpperCase(), e.id]));
  return rows.map((r) => {
    const id = byCode.get(r.code.toUpperCase());
    return id ? { code: r.code, action: "update", aidId: id } : { code: r.code, action: "create" };
  });
}

/** All or nothing: every row is written in one transaction, or none is. */
export async function importAids(harbourId: number, rows: NormalisedAid[], userId: number | null, db = defaultDb): Promise<{ created: number; updated: number }> {
  return db.transaction(async (trx) => {
    const plan = await planImport(harbourId, rows, trx);
    let created = 0;
    let updated = 0;
    for (const [i, p] of plan.entries()) {
      const a = rows[i]!;
      if (p.action === "create") {
        await createAid(harbourId, a, userId, trx);
        created++;
      } else {
        await updateAid(p.aidId!, a, userId, "CSV import", trx);
        updated++;
      }
    }
    return { created, updated };
  });
}
