/**
 * A form generated from a design's JSON Schema (draft 2020-12, as zod emits it).
 * Labels come from the field names (or a schema title), help from the
 * descriptions; defaults, bounds and types choose the control. The API stays
 * the judge of validity: the form only refuses what it cannot send (text in a
 * number box), and shows the API's field errors beside the field they name.
 */
import type { FieldError, JsonSchema } from "./api.js";
import { h, humanize } from "./dom.js";

type Path = Array<string | number>;

/** What reading a control gives: a value, nothing (field left out), or a local problem. */
type Reading = { value: unknown } | { omit: true } | { problem: string; at: Path };

interface Widget {
  element: HTMLElement;
  read(): Reading;
  write(value: unknown): void;
  /** The control to mark for an error at a path inside the field ([] is the field itself). */
  controlAt(path: Path): HTMLElement | null;
}

interface Choice {
  value: unknown;
  label: string;
}

/** Limits this large only guard against overflow; the help line leaves them out. */
const HUGE = 1e9;

const typeOf = (schema: JsonSchema): string | undefined => (Array.isArray(schema.type) ? schema.type.find((t) => t !== "null") : schema.type);

function choicesOf(schema: JsonSchema): Choice[] | null {
  if (schema.enum) return schema.enum.map((v) => ({ value: v, label: String(v) }));
  const options = schema.anyOf ?? schema.oneOf;
  if (options && options.length > 0 && options.every((o) => "const" in o)) {
    return options.map((o) => ({ value: o.const, label: o.title ?? String(o.const) }));
  }
  return null;
}

/** Bounds in words for the help line, leaving out the unbounded limits zod writes for integers. */
function boundsText(schema: JsonSchema): string {
  const stated = (bound: number | undefined): boolean => bound !== undefined && new RegExp(`(^|[^\\d.])${String(bound).replace(".", "\\.")}(?![\\d.]*\\d)`).test(schema.description ?? "");
  const lowBound = schema.exclusiveMinimum ?? schema.minimum;
  const highBound = schema.exclusiveMaximum ?? schema.maximum;
  if (stated(lowBound) && stated(highBound)) return "";
  const low = schema.exclusiveMinimum !== undefined ? `greater than ${schema.exclusiveMinimum}` : schema.minimum !== undefined && Math.abs(schema.minimum) < HUGE ? `at least ${schema.minimum}` : "";
  const high = schema.exclusiveMaximum !== undefined ? `less than ${schema.exclusiveMaximum}` : schema.maximum !== undefined && Math.abs(schema.maximum) < HUGE ? `at most ${schema.maximum}` : "";
  if (low && high) return `${low.charAt(0).toUpperCase()}${low.slice(1)} and ${high}.`;
  if (low || high) return `${(low || high).charAt(0).toUpperCase()}${(low || high).slice(1)}.`;
  return "";
}

function countText(schema: JsonSchema, noun: string): string {
  const { minItems: lo, maxItems: hi } = schema;
  if (lo !== undefined && hi !== undefined) return lo === hi ? `Exactly ${lo} ${noun}.` : `${lo} to ${hi} ${noun}.`;
  if (lo !== undefined) return `At least ${lo} ${noun}.`;
  if (hi !== undefined) return `At most ${hi} ${noun}.`;
  return "";
}

/** Unit, bounds, item count and default, for the help line under a field's description. */
function detailsText(schema: JsonSchema): string {
  const type = typeOf(schema);
  const itemType = schema.items ? typeOf(schema.items) : undefined;
  return [schema.unit ? `Unit: ${schema.unit}.` : "", boundsText(schema),
    type === "array" ? countText(schema, itemType === "object" ? "rows" : "items") : "",
    schema.default !== undefined && !Array.isArray(schema.default) && typeof schema.default !== "object" ? `Default ${String(schema.default)}.` : ""].filter(Boolean).join(" ");
}

const controlId = (path: Path): string => `f-${path.join("-")}`;

function numberInput(id: string, schema: JsonSchema, label?: string): HTMLInputElement {
  const integer = typeOf(schema) === "integer";
  const input = h("input", {
    id,
    type: "number",
    inputmode: integer ? "numeric" : "decimal",
    step: integer ? 1 : "any",
    min: schema.minimum !== undefined && Math.abs(schema.minimum) < HUGE ? schema.minimum : undefined,
    max: schema.maximum !== undefined && Math.abs(schema.maximum) < HUGE ? schema.maximum : undefined,
    "aria-label": label,
  });
  return input;
}

function readNumber(input: HTMLInputElement, integer: boolean, at: Path): Reading {
  if (input.validity.badInput) return { problem: "Enter a number (use a point for decimals).", at };
  if (input.value.trim() === "") return { omit: true };
  const value = Number(input.value);
  if (!Number.isFinite(value)) return { problem: "Enter a finite number.", at };
  if (integer && !Number.isInteger(value)) return { problem: "Enter a whole number.", at };
  return { value };
}

/** A control for one scalar (number, text, choice, yes/no), used alone or in a list or table cell. */
function scalarControl(path: Path, schema: JsonSchema, optional: boolean, cellLabel?: string): { control: HTMLElement; read(): Reading; write(v: unknown): void } {
  const id = controlId(path);
  const choices = choicesOf(schema);
  if (choices) {
    const select = h("select", { id, "aria-label": cellLabel });
    if (optional) select.append(h("option", { value: "" }, "Not set (the design decides)"));
    choices.forEach((c, i) => select.append(h("option", { value: String(i) }, c.label)));
    return {
      control: select,
      read: () => (select.value === "" ? { omit: true } : { value: choices[Number(select.value)]!.value }),
      write: (v) => {
        const i = choices.findIndex((c) => c.value === v);
        select.value = i < 0 ? (optional ? "" : "0") : String(i);
      },
    };
  }
  const type = typeOf(schema);
  if (type === "array") return inlineListControl(path, schema, optional, cellLabel);
  if (type === "number" || type === "integer") {
    const input = numberInput(id, schema, cellLabel);
    return {
      control: input,
      read: () => readNumber(input, type === "integer", path.slice(1)),
      write: (v) => { input.value = typeof v === "number" ? String(v) : ""; },
    };
  }
  if (type === "boolean") {
    const input = h("input", { id, type: "checkbox", "aria-label": cellLabel });
    return { control: input, read: () => ({ value: input.checked }), write: (v) => { input.checked = v === true; } };
  }
  const input = h("input", { id, type: "text", maxlength: schema.maxLength, autocomplete: "off", "aria-label": cellLabel });
  return {
    control: input,
    read: () => (input.value === "" && optional ? { omit: true } : { value: input.value }),
    write: (v) => { input.value = typeof v === "string" ? v : v === undefined || v === null ? "" : String(v); },
  };
}

/**
 * A list inside a table cell (true DLT probabilities of one scenario, say): one
 * text box, items separated by commas. Numbers may also be separated by spaces.
 */
function inlineListControl(path: Path, schema: JsonSchema, optional: boolean, cellLabel?: string): { control: HTMLElement; read(): Reading; write(v: unknown): void } {
  const itemType = schema.items ? typeOf(schema.items) : undefined;
  const numeric = itemType === "number" || itemType === "integer";
  const input = h("input", { id: controlId(path), type: "text", autocomplete: "off", spellcheck: "false", inputmode: numeric ? "decimal" : undefined, class: "inline-list", "aria-label": cellLabel, placeholder: numeric ? "0.1, 0.2, 0.3" : "first, second" });
  return {
    control: input,
    read: () => {
      const parts = input.value.split(numeric ? /[,;\s]+/ : /,/).map((p) => p.trim()).filter((p) => p !== "");
      if (parts.length === 0) return optional ? { omit: true } : { value: [] };
      if (!numeric) return { value: parts };
      const values = parts.map(Number);
      const bad = values.findIndex((v) => !Number.isFinite(v));
      if (bad >= 0) return { problem: `“${parts[bad]}” is not a number; separate numbers with commas.`, at: path.slice(1) };
      if (itemType === "integer" && values.some((v) => !Number.isInteger(v))) return { problem: "Enter whole numbers.", at: path.slice(1) };
      return { value: values };
    },
    write: (v) => { input.value = Array.isArray(v) ? v.join(", ") : ""; },
  };
}

/** Radio buttons for a short list of choices: every option visible, arrow keys move between them. */
function radioGroup(key: string, choices: Choice[], optional: boolean): { element: HTMLElement; read(): Reading; write(v: unknown): void; first(): HTMLElement | null } {
  const options: Array<{ value: unknown; label: string }> = optional ? [{ value: undefined, label: "Not set (the design decides)" }, ...choices] : choices;
  const inputs: HTMLInputElement[] = [];
  const element = h("div", { class: "choices" });
  options.forEach((option, i) => {
    const input = h("input", { type: "radio", name: `f-${key}`, id: `f-${key}-${i}`, value: String(i) });
    inputs.push(input);
    element.append(h("label", { class: "choice", for: input.id }, input, h("span", {}, option.label)));
  });
  return {
    element,
    read: () => {
      const checked = inputs.findIndex((i) => i.checked);
      const value = checked < 0 ? undefined : options[checked]!.value;
      return value === undefined ? { omit: true } : { value };
    },
    write: (v) => {
      const i = options.findIndex((o) => o.value === v);
      inputs.forEach((input, j) => { input.checked = j === (i < 0 ? 0 : i); });
    },
    first: () => inputs.find((i) => i.checked) ?? inputs[0] ?? null,
  };
}

/** A list of numbers or texts: one box per item, with buttons to add and remove items. */
function listWidget(key: string, label: string, schema: JsonSchema, optional: boolean): Widget {
  const itemSchema = schema.items ?? {};
  const list = h("ol", { class: "list-items" });
  const add = h("button", { type: "button", class: "small", "data-action": "add-item" }, `Add ${typeOf(itemSchema) === "string" ? "a label" : "a value"}`);
  const element = h("div", { class: "list-editor" }, list, add);
  let rows: Array<{ item: HTMLLIElement; read(): Reading; write(v: unknown): void; control: HTMLElement }> = [];
  const renumber = (): void => {
    rows.forEach((row, i) => {
      row.control.id = controlId([key, i]);
      row.control.setAttribute("aria-label", `${label}, item ${i + 1}`);
      row.item.querySelector("button")?.setAttribute("aria-label", `Remove item ${i + 1} of ${label}`);
    });
    add.disabled = schema.maxItems !== undefined && rows.length >= schema.maxItems;
  };
  const addRow = (value: unknown): void => {
    const scalar = scalarControl([key, rows.length], itemSchema, false, `${label}, item ${rows.length + 1}`);
    const remove = h("button", { type: "button", class: "small quiet" }, "Remove");
    const item = h("li", {}, scalar.control, remove);
    const row = { item, ...scalar };
    scalar.write(value);
    remove.addEventListener("click", () => {
      rows = rows.filter((r) => r !== row);
      item.remove();
      renumber();
      (rows[0]?.control ?? add).focus();
      element.dispatchEvent(new Event("input", { bubbles: true }));
    });
    rows.push(row);
    list.append(item);
    renumber();
  };
  add.addEventListener("click", () => {
    addRow(typeOf(itemSchema) === "string" ? "" : undefined);
    rows[rows.length - 1]?.control.focus();
    element.dispatchEvent(new Event("input", { bubbles: true }));
  });
  return {
    element,
    read: () => {
      const values: unknown[] = [];
      for (const [i, row] of rows.entries()) {
        const r = row.read();
        if ("problem" in r) return { problem: `Item ${i + 1}: ${r.problem}`, at: [i] };
        if ("omit" in r) return { problem: `Item ${i + 1} is empty: fill it in or remove it.`, at: [i] };
        values.push(r.value);
      }
      return values.length === 0 && optional ? { omit: true } : { value: values };
    },
    write: (v) => {
      rows.forEach((r) => r.item.remove());
      rows = [];
      if (Array.isArray(v)) v.forEach((x) => addRow(x));
      renumber();
    },
    controlAt: (path) => (path.length > 0 ? rows[Number(path[0])]?.control ?? null : rows[0]?.control ?? add),
  };
}

/** A list of records (observed data per dose, say): a small table, one row per record. */
function tableWidget(key: string, label: string, schema: JsonSchema, optional: boolean): Widget {
  const itemSchema = schema.items ?? {};
  const columns = Object.entries(itemSchema.properties ?? {});
  const required = new Set(itemSchema.required ?? []);
  const body = h("tbody");
  const head = h("thead", {}, h("tr", {}, h("th", { scope: "col" }, "#"), ...columns.map(([name, s]) => h("th", { scope: "col", title: s.description ?? "" }, s.title ?? humanize(name))), h("th", { scope: "col" }, h("span", { class: "visually-hidden" }, "Actions"))));
  const add = h("button", { type: "button", class: "small", "data-action": "add-row" }, "Add a row");
  const legend = h("dl", { class: "column-help" }, ...columns.flatMap(([name, s]) => (s.description ? [h("dt", {}, s.title ?? humanize(name)), h("dd", {}, s.description)] : [])));
  const table = h("table", {}, head, body);
  const empty = h("p", { class: "note" }, "No rows yet.");
  const element = h("div", { class: "table-editor" }, h("div", { class: "table-scroll" }, table), empty, add, legend);
  type Row = { tr: HTMLTableRowElement; cells: Array<{ name: string; control: HTMLElement; read(): Reading; write(v: unknown): void }> };
  let rows: Row[] = [];
  const renumber = (): void => {
    rows.forEach((row, i) => {
      row.tr.firstElementChild!.textContent = String(i + 1);
      row.cells.forEach((cell) => {
        cell.control.id = controlId([key, i, cell.name]);
        const column = itemSchema.properties?.[cell.name];
        cell.control.setAttribute("aria-label", `Row ${i + 1}, ${column?.title ?? humanize(cell.name)}`);
      });
      row.tr.querySelector("button")?.setAttribute("aria-label", `Remove row ${i + 1}`);
    });
    add.disabled = schema.maxItems !== undefined && rows.length >= schema.maxItems;
    table.hidden = rows.length === 0;
    empty.hidden = rows.length > 0;
  };
  const addRow = (value: Record<string, unknown>): void => {
    const i = rows.length;
    const cells = columns.map(([name, s]) => ({ name, ...scalarControl([key, i, name], s, !required.has(name), `Row ${i + 1}, ${s.title ?? humanize(name)}`) }));
    const remove = h("button", { type: "button", class: "small quiet remove", title: "Remove this row" }, "✕");
    const tr = h("tr", {}, h("th", { scope: "row" }, String(i + 1)), ...cells.map((c) => h("td", {}, c.control)), h("td", {}, remove));
    const row: Row = { tr, cells };
    cells.forEach((c) => c.write(value[c.name]));
    remove.addEventListener("click", () => {
      rows = rows.filter((r) => r !== row);
      tr.remove();
      renumber();
      (rows[0]?.cells[0]?.control ?? add).focus();
      element.dispatchEvent(new Event("input", { bubbles: true }));
    });
    rows.push(row);
    body.append(tr);
    renumber();
  };
  add.addEventListener("click", () => {
    addRow({});
    rows[rows.length - 1]?.cells[0]?.control.focus();
    element.dispatchEvent(new Event("input", { bubbles: true }));
  });
  return {
    element,
    read: () => {
      const values: Array<Record<string, unknown>> = [];
      for (const [i, row] of rows.entries()) {
        const record: Record<string, unknown> = {};
        for (const cell of row.cells) {
          const r = cell.read();
          const column = itemSchema.properties?.[cell.name];
          if ("problem" in r) return { problem: `Row ${i + 1}, ${column?.title ?? humanize(cell.name)}: ${r.problem}`, at: [i, cell.name] };
          if ("value" in r) record[cell.name] = r.value;
        }
        values.push(record);
      }
      return values.length === 0 && optional ? { omit: true } : { value: values };
    },
    write: (v) => {
      rows.forEach((r) => r.tr.remove());
      rows = [];
      if (Array.isArray(v)) v.forEach((x) => addRow(x && typeof x === "object" ? (x as Record<string, unknown>) : {}));
      renumber();
    },
    controlAt: (path) => {
      if (path.length === 0) return rows[0]?.cells[0]?.control ?? add;
      const row = rows[Number(path[0])];
      if (!row) return add;
      return (path.length > 1 ? row.cells.find((c) => c.name === String(path[1]))?.control : row.cells[0]?.control) ?? null;
    },
  };
}

/** One record (a single scenario, say): its fields one under another, each with its own label and help. */
function objectWidget(key: string, label: string, schema: JsonSchema, optional: boolean): Widget {
  const required = new Set(schema.required ?? []);
  const parts = Object.entries(schema.properties ?? {}).map(([name, s]) => {
    const scalar = scalarControl([key, name], s, !required.has(name) && s.default === undefined);
    const helpId = `help-${key}-${name}`;
    scalar.control.setAttribute("aria-describedby", helpId);
    const element = h("div", { class: "subfield" },
      h("label", { for: scalar.control.id }, s.title ?? humanize(name)),
      h("p", { class: "help", id: helpId }, s.description ?? "", detailsText(s) ? h("span", { class: "bounds" }, ` ${detailsText(s)}`) : null),
      scalar.control);
    return { name, element, ...scalar };
  });
  const subfields = h("div", { class: "subfields" }, ...parts.map((p) => p.element));
  // A record the design can do without is switched on and off as a whole, so leaving it out stays possible.
  const include = optional ? h("input", { type: "checkbox", id: controlId([key, "include"]) }) : null;
  const showParts = (): void => { if (include) subfields.hidden = !include.checked; };
  include?.addEventListener("change", showParts);
  const element = include
    ? h("div", {}, h("div", { class: "check-row" }, include, h("label", { for: include.id }, `Include ${label.charAt(0).toLowerCase()}${label.slice(1)}`)), subfields)
    : subfields;
  return {
    element,
    read: () => {
      if (include && !include.checked) return { omit: true };
      const record: Record<string, unknown> = {};
      for (const part of parts) {
        const r = part.read();
        if ("problem" in r) return { problem: `${humanize(part.name)}: ${r.problem}`, at: [part.name] };
        if ("value" in r) record[part.name] = r.value;
      }
      return { value: record };
    },
    write: (v) => {
      const given = v !== null && typeof v === "object";
      const record = given ? (v as Record<string, unknown>) : {};
      for (const part of parts) part.write(record[part.name] ?? schema.properties?.[part.name]?.default);
      if (include) include.checked = given;
      showParts();
    },
    controlAt: (path) => (path.length === 0 && include ? include : (parts.find((p) => p.name === String(path[0])) ?? parts[0])?.control ?? null),
  };
}

/** Anything the form has no control for: JSON typed in by hand. */
function jsonWidget(key: string): Widget {
  const area = h("textarea", { id: controlId([key]), rows: 3, spellcheck: "false", class: "code" });
  return {
    element: area,
    read: () => {
      if (area.value.trim() === "") return { omit: true };
      try {
        return { value: JSON.parse(area.value) };
      } catch {
        return { problem: "Enter valid JSON.", at: [] };
      }
    },
    write: (v) => { area.value = v === undefined ? "" : JSON.stringify(v); },
    controlAt: () => area,
  };
}

interface Field {
  key: string;
  widget: Widget;
  container: HTMLElement;
  error: HTMLElement;
  helpId: string;
}

interface FormValues {
  values: Record<string, unknown>;
  problems: FieldError[];
}

export class SchemaForm {
  readonly element: HTMLElement;
  private readonly fields = new Map<string, Field>();

  constructor(schema: JsonSchema) {
    this.element = h("div", { class: "fields" });
    const required = new Set(schema.required ?? []);
    for (const [key, property] of Object.entries(schema.properties ?? {})) {
      const field = this.buildField(key, property, required.has(key));
      this.fields.set(key, field);
      this.element.append(field.container);
    }
  }

  private buildField(key: string, schema: JsonSchema, required: boolean): Field {
    const label = schema.title ?? humanize(key);
    const optional = !required && schema.default === undefined;
    const helpId = `help-${key}`;
    const errorId = `err-${key}`;
    const type = typeOf(schema);
    const choices = choicesOf(schema);
    const itemType = schema.items ? typeOf(schema.items) : undefined;
    const details = detailsText(schema);
    const help = h("p", { class: "help", id: helpId }, schema.description ?? "", details ? h("span", { class: "bounds" }, ` ${details}`) : null);
    const error = h("p", { class: "field-error", id: errorId, hidden: true });
    const labelText = [label, optional ? h("span", { class: "optional" }, " (optional)") : null];
    let widget: Widget;
    let container: HTMLElement;
    if (choices && choices.length <= 4) {
      const group = radioGroup(key, choices, optional);
      widget = { element: group.element, read: group.read, write: group.write, controlAt: () => group.first() };
      container = h("fieldset", { class: "field", "data-field": key, "aria-describedby": `${helpId} ${errorId}` }, h("legend", {}, ...labelText), help, group.element, error);
    } else if (type === "array" && (itemType === "object")) {
      widget = tableWidget(key, label, schema, optional);
      container = h("fieldset", { class: "field wide", "data-field": key, "aria-describedby": `${helpId} ${errorId}` }, h("legend", {}, ...labelText), help, widget.element, error);
    } else if (type === "array" && schema.items && (itemType === "number" || itemType === "integer" || itemType === "string" || choicesOf(schema.items))) {
      widget = listWidget(key, label, schema, optional);
      container = h("fieldset", { class: "field", "data-field": key, "aria-describedby": `${helpId} ${errorId}` }, h("legend", {}, ...labelText), help, widget.element, error);
    } else if (type === "object" && schema.properties && Object.values(schema.properties).every((p) => typeOf(p) !== "object" && !(typeOf(p) === "array" && p.items && typeOf(p.items) === "object"))) {
      widget = objectWidget(key, label, schema, optional);
      container = h("fieldset", { class: "field", "data-field": key, "aria-describedby": `${helpId} ${errorId}` }, h("legend", {}, ...labelText), help, widget.element, error);
    } else if (choices || type === "number" || type === "integer" || type === "string" || type === "boolean") {
      const scalar = scalarControl([key], schema, optional);
      scalar.control.setAttribute("aria-describedby", `${helpId} ${errorId}`);
      if (required) scalar.control.setAttribute("aria-required", "true");
      widget = { element: scalar.control, read: scalar.read, write: scalar.write, controlAt: () => scalar.control };
      const labelElement = h("label", { for: scalar.control.id }, ...labelText);
      container = type === "boolean"
        ? h("div", { class: "field check", "data-field": key }, h("div", { class: "check-row" }, scalar.control, labelElement), help, error)
        : h("div", { class: "field", "data-field": key }, labelElement, help, scalar.control, error);
    } else {
      widget = jsonWidget(key);
      widget.element.setAttribute("aria-describedby", `${helpId} ${errorId}`);
      container = h("div", { class: "field", "data-field": key }, h("label", { for: widget.element.id }, ...labelText), help, widget.element, error);
    }
    widget.write(schema.default);
    return { key, widget, container, error, helpId };
  }

  /** Fills every field from a set of inputs (fields not named keep their schema default). */
  write(values: Record<string, unknown>): void {
    for (const [key, field] of this.fields) {
      if (key in values) field.widget.write(values[key]);
    }
  }

  read(): FormValues {
    const values: Record<string, unknown> = {};
    const problems: FieldError[] = [];
    for (const [key, field] of this.fields) {
      const reading = field.widget.read();
      if ("problem" in reading) {
        const path = [key, ...reading.at];
        problems.push({ path: `inputs.${path.join(".")}`, pointer: `/inputs/${path.join("/")}`, message: reading.problem });
      } else if ("value" in reading) {
        values[key] = reading.value;
      }
    }
    return { values, problems };
  }

  clearErrors(): void {
    for (const field of this.fields.values()) {
      field.error.hidden = true;
      field.error.replaceChildren();
      field.container.classList.remove("invalid");
    }
    for (const marked of this.element.querySelectorAll("[aria-invalid]")) marked.removeAttribute("aria-invalid");
  }

  /**
   * Shows each error beside the field it names and returns those that name no
   * field (they belong in the page's summary). Paths are the API's pointers
   * ("/inputs/observed/2/patients").
   */
  showErrors(errors: FieldError[]): Array<FieldError & { controlId?: string }> {
    this.clearErrors();
    const placed: Array<FieldError & { controlId?: string }> = [];
    for (const error of errors) {
      const segments = error.pointer.split("/").slice(1).map((s) => s.replace(/~1/g, "/").replace(/~0/g, "~"));
      const [root, key, ...rest] = segments;
      const field = root === "inputs" && key !== undefined ? this.fields.get(key) : undefined;
      if (!field) {
        placed.push(error);
        continue;
      }
      const control = field.widget.controlAt(rest.map((s) => (/^\d+$/.test(s) ? Number(s) : s)));
      control?.setAttribute("aria-invalid", "true");
      if (control && field.container.tagName === "FIELDSET" && !control.getAttribute("aria-describedby")?.includes(field.error.id)) {
        control.setAttribute("aria-describedby", `${field.helpId} ${field.error.id}`);
      }
      field.container.classList.add("invalid");
      field.error.hidden = false;
      const where = rest.length > 0 ? `${describeWhere(rest)}: ` : "";
      field.error.append(h("span", { class: "error-line" }, `${where}${error.message}`));
      placed.push({ ...error, ...(control?.id ? { controlId: control.id } : {}) });
    }
    return placed;
  }

  labelFor(key: string): string {
    const legend = this.fields.get(key)?.container.querySelector("legend, label");
    return legend?.firstChild?.textContent ?? key;
  }
}

function describeWhere(rest: string[]): string {
  const [index, column] = rest;
  if (index !== undefined && /^\d+$/.test(index)) {
    return column ? `Row ${Number(index) + 1}, ${humanize(column)}` : `Item ${Number(index) + 1}`;
  }
  return rest.join(".");
}
