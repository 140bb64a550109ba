import { parse } from "csv-parse/sync";
import { data, Form, Link } from "react-router";
import type { Route } from "./+types/staff.aids.import";
import { Caution } from "~/components/Caution";
import { FormError } from "~/components/forms";
import { AID_CSV_COLUMNS, checkCsvHeader, validateCsvRows, type CsvRowResult } from "~/lib/aids/schema";
import { importAids, planImport } from "~/models/aid.server";
import { getDefaultHarbour } from "~/models/harbour.server";
import { requireCapability } from "~/services/auth.server";
import { readForm } from "~/services/form.server";
import { redirectWithToast } from "~/services/session.server";

export const meta: Route.MetaFunction = () => [{ title: "Import aids (CSV) · Tidewire" }];

const MAX_CSV_BYTES = 1024 * 1024;
const MAX_ROWS = 2000;

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "aid:manage");
  return { columns: [...AID_CSV_COLUMNS] };
}

type PreviewRow = { line: number; ok: boolean; code: string; name: string; action?: "create" | "update"; light?: string | null; warning?: string | null; errors?: { column: string; message: string }[] };
type ImportData = { error?: string; csvText?: string; rows?: PreviewRow[]; okCount?: number; errorCount?: number };

/** Parses CSV text into records; errors name the line. A leading ' (spreadsheet guard on export) is removed. */
function readCsv(text: string): { records?: Record<string, string>[]; error?: string } {
  let rows: string[][];
  try {
    rows = parse(text, { bom: true, skip_empty_lines: true, relax_column_count: false, trim: true });
  } catch (e) {
    const err = e as { message?: string; lines?: number };
    return { error: `The file is not valid CSV${err.lines ? ` (near line ${err.lines})` : ""}: ${err.message ?? ""}` };
  }
  if (rows.length === 0) return { error: "The file is empty" };
  const header = rows[0]!.map((h) => h.trim().toLowerCase());
  const headerError = checkCsvHeader(header);
  if (headerError) return { error: headerError };
  if (rows.length - 1 > MAX_ROWS) return { error: `At most ${MAX_ROWS} aids per import (this file has ${rows.length - 1})` };
  const unguard = (c: string) => (/^'[=+\-@]/.test(c) ? c.slice(1) : c);
  return { records: rows.slice(1).map((r) => Object.fromEntries(header.map((h, i) => [h, unguard(r[i] ?? "")]))) };
}

async function textOf(form: FormData): Promise<string | null> {
  const pasted = form.get("csvText");
  if (typeof pasted === "string" && pasted.trim()) return pasted;
  const file = form.get("file");
  if (file && typeof file === "object" && "text" in file && (file as File).size > 0) {
    if ((file as File).size > MAX_CSV_BYTES) return "\u0000too-big";
    return (file as File).text();
  }
  return null;
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireCapability(request, "aid:manage");
  const harbour = await getDefaultHarbour();
  if (!harbour) throw data({ error: "No harbour is set up yet." }, { status: 404 });
  const form = await readForm(request);
  const intent = form.get("intent") === "commit" ? "commit" : "preview";
  const text = await textOf(form);
  if (text === null) return data<ImportData>({ error: "Choose a CSV file (or paste its text)" }, { status: 400 });
  if (text === "\u0000too-big" || text.length > MAX_CSV_BYTES) return data<ImportData>({ error: "The file is larger than 1 MB" }, { status: 400 });
  const { records, error } = readCsv(text);
  if (error || !records) return data<ImportData>({ error, csvText: text }, { status: 400 });
  const results: CsvRowResult[] = validateCsvRows(records);
  const valid = results.filter((r) => r.ok).map((r) => r.value!);
  const plan = await planImport(harbour.id, valid);
  let k = 0;
  const rows: PreviewRow[] = results.map((r, i) => {
    const rec = records[i]!;
    if (!r.ok) return { line: r.line, ok: false, code: rec.code ?? "", name: rec.name ?? "", errors: r.errors };
    const p = plan[k++]!;
    return { line: r.line, ok: true, code: r.value!.code, name: r.value!.name, action: p.action, light: r.value!.light?.description ?? null, warning: r.value!.lightWarning };
  });
  const errorCount = rows.filter((r) => !r.ok).length;
  if (intent === "commit") {
    if (errorCount > 0) {
      return data<ImportData>({ error: `Nothing was imported: ${errorCount} row${errorCount === 1 ? " has" : "s have"} errors. Correct the file and try again.`, csvText: text, rows, okCount: valid.length, errorCount }, { status: 400 });
    }
    const r = await importAids(harbour.id, valid, user.id);
    return redirectWithToast(request, "/staff/aids", { kind: "success", message: `Imported ${valid.length} aids: ${r.created} new, ${r.updated} updated.` });
  }
  return data<ImportData>({ csvText: text, rows, okCount: valid.length, errorCount }, { status: errorCount ? 400 : 200 });
}

export default function ImportAids({ loaderData, actionData }: Route.ComponentProps) {
  const d = actionData as ImportData | undefined;
  return (
    <div className="mx-auto max-w-5xl">
      <p className="text-sm">
        <Link to="/staff/aids" className="underline">
          ← Aids register
        </Link>
      </p>
      <h1 className="mt-1 text-2xl font-bold">Import aids from CSV</h1>
      <p className="mt-2 text-sm text-slate">
        Columns: <code>{loaderData.columns.join(",")}</code>. Existing codes are updated, new ones added. The import is all or nothing: it is
        only written when every row is valid. <a href="/staff/aids.csv" className="underline">Export the register</a> for a template.
      </p>
      <div className="mt-3">
        <Caution compact />
      </div>
      <Form method="post" encType="multipart/form-data" className="card mt-6 grid gap-3">
        <input type="hidden" name="intent" value="preview" />
        <label className="field-label" htmlFor="file">
          CSV file
        </label>
        <input id="file" name="file" type="file" accept=".csv,text/csv" className="field-input" />
        <div>
          <button className="btn-primary">Preview</button>
        </div>
      </Form>
      <div className="mt-4">
        <FormError error={d?.error} />
      </div>
      {d?.rows ? (
        <section className="mt-6">
          <h2 className="text-lg font-bold">
            Preview: {d.okCount} valid, {d.errorCount} with errors
          </h2>
          <table className="mt-2 w-full text-left text-sm" data-testid="import-preview">
            <thead>
              <tr className="border-b border-mist">
                <th className="py-2">Line</th>
                <th>Code</th>
                <th>Name</th>
                <th>Result</th>
              </tr>
            </thead>
            <tbody>
              {d.rows.map((r) => (
                <tr key={r.line} className={`border-b border-mist ${r.ok ? "" : "bg-danger-light"}`}>
                  <td className="py-2">{r.line}</td>
                  <td>{r.code}</td>
                  <td>{r.name}</td>
                  <td>
                    {r.ok ? (
                      <>
                        {r.action === "create" ? "New" : "Update"}
                        {r.light ? ` · ${r.light}` : ""}
                        {r.warning ? <div className="text-warn">{r.warning}</div> : null}
                      </>
                    ) : (
                      <ul>
                        {r.errors!.map((e) => (
                          <li key={e.column + e.message} className="text-danger">
                            <strong>{e.column}</strong>: {e.message}
                          </li>
                        ))}
                      </ul>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          {d.errorCount === 0 ? (
            <Form method="post" className="mt-4">
              <input type="hidden" name="intent" value="commit" />
              <textarea name="csvText" defaultValue={d.csvText} hidden readOnly />
              <button className="btn-primary">Import {d.okCount} aids</button>
            </Form>
          ) : (
            <p className="mt-4 font-semibold">Correct the rows with errors and preview again; nothing has been imported.</p>
          )}
        </section>
      ) : null}
    </div>
  );
}
