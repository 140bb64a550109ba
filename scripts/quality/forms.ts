// The POST forms on a rendered page, read with htmlparser2: action, field names and the values
// of hidden fields (intent, token, ids), so fuzzing follows the forms as they are built.
import { Parser } from "htmlparser2";

export interface FormField {
  name: string;
  type: string; // input type, "select" or "textarea"
  value: string;
  options: string[];
}

export interface PageForm {
  action: string;
  enctype: string;
  fields: FormField[];
  /** "intent=value" when the form carries a hidden intent, for naming the case. */
  label: string;
}

export function postForms(html: string, pagePath: string): PageForm[] {
  const forms: PageForm[] = [];
  let current: PageForm | null = null;
  let select: FormField | null = null;
  const parser = new Parser(
    {
      onopentag(name, a) {
        if (name === "form") {
          if ((a.method ?? "get").toLowerCase() !== "post") return;
          current = { action: a.action || pagePath, enctype: a.enctype ?? "application/x-www-form-urlencoded", fields: [], label: "" };
          return;
        }
        if (!current) return;
        if (name === "input" && a.name) {
          const type = (a.type ?? "text").toLowerCase();
          if (["submit", "button", "image", "reset"].includes(type)) return;
          current.fields.push({ name: a.name, type, value: a.value ?? "", options: [] });
        } else if (name === "textarea" && a.name) {
          current.fields.push({ name: a.name, type: "textarea", value: "", options: [] });
        } else if (name === "select" && a.name) {
          select = { name: a.name, type: "select", value: "", options: [] };
          current.fields.push(select);
        } else if (name === "option" && select) {
          select.options.push(a.value ?? "");
        } else if (name === "button" && a.name && a.value !== undefined) {
          current.fields.push({ name: a.name, type: "hidden", value: a.value, options: [] });
        }
      },
      onclosetag(name) {
        if (name === "select") select = null;
        if (name === "form" && current) {
          const f: PageForm = current;
          const intent = f.fields.find((x) => x.name === "intent" && x.type === "hidden");
          f.label = `${f.action}${intent ? ` intent=${intent.value}` : ""}`;
          forms.push(f);
          current = null;
        }
      },
    },
    { decodeEntities: true },
  );
  parser.write(html);
  parser.end();
  // One per action + intent: tables repeat the same form per row.
  const seen = new Set<string>();
  return forms.filter((f) => (seen.has(f.label) ? false : (seen.add(f.label), true)));
}
