// stavegen's page: a form over the spar file's keys, kept in step with the engine through the API.
// Everything is computed by the server (the same engine as the command line); this script only
// edits the file's text (through /api/edit, which keeps comments), asks, and shows the answers.
"use strict";

const DEBOUNCE_MS = 250;

// The spar file's keys, grouped as the file is. kind: text | choice | scalar | list | pairs | bool |
// wood | wall | diameters | staves | notch | plugs. Keys the page does not know are shown too.
const SCHEMA = [
  {table: "spar", title: "The spar", fields: [
    {key: "name", label: "name", kind: "text"},
    {key: "units", label: "units", kind: "choice", choices: "units",
     hint: "bare numbers are in this unit; any length may carry its own (\"16 ft\", \"4 3/4\", \"120 mm\")"},
    {key: "length", label: "length, heel to head", kind: "scalar"},
  ]},
  {table: "plan", title: "The plan: the solid spar drawn", fields: [
    {key: "wood", label: "wood", kind: "wood"},
    {key: "stations", label: "diameters", kind: "pairs", cols: ["from heel", "diameter"]},
  ]},
  {table: "hollow", title: "The hollow spar", fields: [
    {key: "wood", label: "wood", kind: "wood"},
    {key: "staves", label: "staves", kind: "staves", hint: "4 to 24 (5 or more for a birdsmouth), or auto"},
    {key: "joint", label: "joint", kind: "choice", choices: "joint"},
    {key: "notch", label: "notch", kind: "notch"},
    {key: "wall", label: "wall (stave thickness)", kind: "wall"},
    {key: "stations", label: "finished diameters", kind: "diameters"},
    {key: "lamination_factor", label: "lamination factor", kind: "scalar", optional: true},
    {key: "margin", label: "margin on EI", kind: "scalar", optional: true},
    {key: "min_strength_ratio", label: "least strength ratio", kind: "scalar", optional: true},
    {key: "min_corner_wall", label: "least wall at the bore corners", kind: "scalar", optional: true},
    {key: "planing_allowance", label: "planing allowance", kind: "scalar", optional: true},
    {key: "end_allowance", label: "end allowance", kind: "scalar", optional: true},
    {key: "taper", label: "taper", kind: "choice", choices: "taper", optional: true},
    {key: "plug", label: "plugs", kind: "plugs"},
  ]},
  {table: "stock", title: "Stock: the boards", optional: true, fields: [
    {key: "thickness", label: "dressed thickness", kind: "scalar"},
    {key: "nominal_thickness", label: "nominal thickness", kind: "scalar", optional: true},
    {key: "widths", label: "dressed widths", kind: "list"},
    {key: "nominal_widths", label: "nominal widths", kind: "list", optional: true},
    {key: "lengths", label: "lengths", kind: "list"},
    {key: "kerf", label: "kerf", kind: "scalar", optional: true},
    {key: "scarf_ratio", label: "scarf ratio", kind: "scalar", optional: true},
    {key: "scarf_stagger", label: "scarf stagger", kind: "scalar", optional: true},
    {key: "no_scarf", label: "no scarf between", kind: "pairs", cols: ["from", "to"], optional: true},
    {key: "waste", label: "waste added", kind: "scalar", optional: true},
    {key: "edge_allowance", label: "edge allowance", kind: "scalar", optional: true},
  ]},
  {table: "output", title: "Output", optional: true, fields: [
    {key: "paper", label: "paper", kind: "choice", choices: "paper", optional: true},
    {key: "mark_spacing", label: "station marks every", kind: "scalar", optional: true},
    {key: "templates_on_boards", label: "templates on boards", kind: "bool", optional: true},
  ]},
];
const NOTCH_KEYS = ["depth", "apex_height", "apex_fraction"];
const WOOD_KEYS = ["name", "moe", "mor", "density", "source"];

const state = {
  text: "", name: "", data: null, start: null,
  seq: 0, updates: 0, lastKeyAt: null, at: "", chain: Promise.resolve(),
  pending: new Map(), timer: null, rebuild: false, doc: null, view: null,
  // A boat file opened on the page: its text, its spar files' texts by the names it lists, the one being
  // edited, and its own check (the whole boat: every spar's verdict and the one board order).
  boat: null,
};
window.stavegenTimings = [];

const $ = (id) => document.getElementById(id);
const el = (tag, attrs = {}, ...children) => {
  const node = document.createElement(tag);
  for (const [k, v] of Object.entries(attrs)) {
    if (v === undefined || v === null || v === false) continue;
    if (k === "text") node.textContent = v;
    else if (k.startsWith("on")) node.addEventListener(k.slice(2), v);
    else node.setAttribute(k, v === true ? "" : v);
  }
  for (const c of children) if (c !== null && c !== undefined) node.append(c);
  return node;
};

// ---- talking to the server ---------------------------------------------------------------

async function post(path, body, type = "text/plain; charset=utf-8") {
  const response = await fetch(path, {method: "POST", body, headers: {"Content-Type": type}});
  const kind = response.headers.get("Content-Type") || "";
  if (kind.startsWith("application/json")) {
    return {ok: response.ok, status: response.status, body: await response.json(), response};
  }
  return {ok: response.ok, status: response.status, body: await response.blob(), response};
}

function query(extra = {}) {
  const params = new URLSearchParams({name: state.name});
  if (hasTable("stock")) params.set("layout", "1");
  for (const [k, v] of Object.entries(extra)) params.set(k, v);
  return "?" + params.toString();
}

function hasTable(name) {
  return state.data !== null && typeof state.data[name] === "object" && !Array.isArray(state.data[name]);
}

// ---- editing -------------------------------------------------------------------------------

let opCounter = 0;
function queue(op, {rebuild = false, now = false} = {}) {
  const id = op.set !== undefined ? "set:" + op.set : "op:" + (opCounter++);
  state.pending.delete(id);
  state.pending.set(id, op);
  state.rebuild = state.rebuild || rebuild;
  state.lastKeyAt = performance.now();
  document.body.dataset.busy = "1";
  clearTimeout(state.timer);
  state.timer = setTimeout(flush, now ? 0 : DEBOUNCE_MS);
}

function flush() {
  state.timer = null;
  const ops = [...state.pending.values()];
  const rebuild = state.rebuild;
  state.pending.clear();
  state.rebuild = false;
  state.chain = state.chain.then(() => applyEdits(ops, rebuild)).catch((e) => showMessage("", String(e)));
}

async function applyEdits(ops, rebuild) {
  const answer = await post("/api/edit?" + new URLSearchParams({name: state.name}),
                            JSON.stringify({text: state.text, ops}), "application/json");
  if (!answer.ok) {
    clearMessages();
    showMessage(answer.body.key || "", answer.body.message);
    finishUpdate(state.seq, false);
    return;
  }
  state.text = answer.body.text;
  state.data = answer.body.data;
  syncRaw();
  if (rebuild) buildForm();
  await refresh();
}

function setValue(key, value, options = {}) {
  const op = {set: key, value};
  if (options.string) op.string = true;
  queue(op, options);
}

// ---- the form --------------------------------------------------------------------------------

function shown(value) {
  if (value === undefined || value === null) return "";
  if (typeof value === "string") return value;
  if (typeof value === "number" || typeof value === "boolean") return String(value);
  return JSON.stringify(value);
}

function fieldRow(key, label, control, hint) {
  return el("div", {class: "field", "data-field": key},
    el("label", {for: "f-" + key, text: label}),
    control,
    hint ? el("div", {class: "hint", text: hint}) : null,
    el("div", {class: "msg", "data-msg-for": key}));
}

function textInput(key, value, {string = false, placeholder = ""} = {}) {
  return el("input", {id: "f-" + key, "data-key": key, value: shown(value), placeholder,
    oninput: (e) => setValue(key, e.target.value, {string})});
}

function choiceInput(key, value, choices, {optional = false, rebuild = false, extra = null} = {}) {
  const select = el("select", {id: "f-" + key, "data-key": key});
  if (optional) select.append(el("option", {value: "", text: "(default)"}));
  const list = [...choices];
  if (value !== undefined && value !== null && typeof value === "string" && value && !list.includes(value)) {
    list.push(value);
  }
  for (const c of list) select.append(el("option", {value: c, text: c}));
  select.value = value === undefined || value === null ? "" : String(value);
  select.addEventListener("change", () => {
    const v = select.value;
    if (extra) extra(v);
    setValue(key, v === "" ? null : v, {string: true, rebuild, now: true});
  });
  return select;
}

function listInput(key, value) {
  const text = Array.isArray(value) ? value.map(shown).join(", ") : shown(value);
  return el("input", {id: "f-" + key, "data-key": key, value: text, placeholder: "e.g. 3 1/2, 5 1/2, 7 1/4",
    oninput: (e) => {
      const t = e.target.value.trim();
      if (t === "") setValue(key, null);
      else if (t.startsWith("[")) setValue(key, t);
      else setValue(key, t.split(",").map((s) => s.trim()));
    }});
}

function pairsInput(key, value, cols) {
  const box = el("div", {class: "pairs", id: "f-" + key, "data-key": key});
  const rows = Array.isArray(value) ? value.map((p) => (Array.isArray(p) ? [...p] : [p, ""])) : [];
  const send = (rebuild) => setValue(key, rows.map((r) => r.map(shown)), {rebuild, now: rebuild});
  const table = el("table", {class: "pairs-table"});
  table.append(el("tr", {}, el("th", {text: cols[0]}), el("th", {text: cols[1]}), el("th")));
  rows.forEach((row, i) => {
    const tr = el("tr", {"data-key": `${key}[${i + 1}]`});
    for (let j = 0; j < 2; j++) {
      tr.append(el("td", {}, el("input", {value: shown(row[j]), "aria-label": `${key} ${i + 1} ${cols[j]}`,
        "data-cell": `${key}[${i + 1}][${j + 1}]`,
        oninput: (e) => { rows[i][j] = e.target.value; send(false); }})));
    }
    tr.append(el("td", {}, el("button", {type: "button", class: "small", title: "remove this row", text: "−",
      onclick: () => { rows.splice(i, 1); send(true); }})));
    table.append(tr);
  });
  box.append(table, el("button", {type: "button", class: "small", text: "+ row",
    onclick: () => { rows.push(["", ""]); send(true); }}));
  return box;
}

function woodInput(key, value, {plug = false} = {}) {
  const box = el("div", {class: "wood"});
  const woods = state.start.woods;
  const select = el("select", {id: "f-" + key, "data-key": key});
  if (plug) select.append(el("option", {value: "", text: "(the hollow spar's wood)"}));
  for (const w of woods) select.append(el("option", {value: w.key, text: `${w.name} (${w.key})`}));
  select.append(el("option", {value: "{}", text: "defined here…"}));
  const custom = value !== null && typeof value === "object";
  if (typeof value === "string" && !woods.some((w) => w.key === value)) {
    select.append(el("option", {value, text: value}));
  }
  select.value = custom ? "{}" : (value === undefined ? "" : value);
  select.addEventListener("change", () => {
    if (select.value === "{}") {
      setValue(key, {name: "my wood", moe: "", mor: "", density: ""}, {rebuild: true, now: true});
    } else {
      setValue(key, select.value === "" ? null : select.value, {string: true, rebuild: true, now: true});
    }
  });
  box.append(select);
  if (custom) {
    const sub = el("div", {class: "subfields"});
    for (const k of WOOD_KEYS) {
      const full = `${key}.${k}`;
      sub.append(fieldRow(full, k, textInput(full, value[k], {string: k === "name" || k === "source"}),
        k === "moe" || k === "mor" ? "psi in an inch file, MPa in a mm file, or with its unit" :
        k === "density" ? "lb/ft³ in an inch file, kg/m³ in a mm file" : null));
    }
    box.append(sub);
  }
  return box;
}

function modeInput(key, modes, mode, onMode) {
  const select = el("select", {id: "f-" + key + "-mode", "aria-label": key + " is given as"});
  for (const [value, label] of modes) select.append(el("option", {value, text: label}));
  select.value = mode;
  select.addEventListener("change", () => onMode(select.value));
  return select;
}

function firstValue(v) {
  if (Array.isArray(v)) return Array.isArray(v[0]) ? v[0][1] : v[0];
  return v;
}

function wallInput(key, value) {
  const mode = Array.isArray(value) ? "schedule" : (value === "auto" || value === "auto-tapered" ? value : "one");
  const length = state.data.spar ? state.data.spar.length : undefined;
  const box = el("div", {class: "combo"});
  box.append(modeInput(key, [["one", "one thickness"], ["schedule", "along the spar"],
    ["auto", "auto: least constant"], ["auto-tapered", "auto-tapered: least at each station"]], mode, (m) => {
    let v;
    if (m === "one") v = shown(firstValue(value)) || "";
    else if (m === "schedule") v = [["0", shown(firstValue(value))], [shown(length), shown(firstValue(value))]];
    else v = m;
    setValue(key, v, {rebuild: true, now: true, string: m.startsWith("auto")});
  }));
  if (mode === "one") box.append(textInput(key, value));
  if (mode === "schedule") box.append(pairsInput(key, value, ["from heel", "thickness"]));
  return box;
}

function diametersInput(key, value) {
  const mode = value === undefined ? "plan" : (value === "auto" ? "auto" : "given");
  const box = el("div", {class: "combo"});
  box.append(modeInput(key, [["plan", "the plan's"], ["given", "given here"],
    ["auto", "auto: the plan's, enlarged as needed"]], mode, (m) => {
    if (m === "plan") setValue(key, null, {rebuild: true, now: true});
    else if (m === "auto") setValue(key, "auto", {rebuild: true, now: true, string: true});
    else {
      const plan = state.data.plan && Array.isArray(state.data.plan.stations) ? state.data.plan.stations : [];
      setValue(key, plan.map((p) => (Array.isArray(p) ? p.map(shown) : [shown(p), ""])), {rebuild: true, now: true});
    }
  }));
  if (mode === "given") box.append(pairsInput(key, value, ["from heel", "diameter"]));
  return box;
}

function notchInput(key, value, joint) {
  const box = el("div", {class: "subfields", id: "f-" + key, "data-key": key});
  if (joint !== "birdsmouth-custom") {
    box.append(el("span", {class: "hint", text: "for joint = birdsmouth-custom only"}));
    return box;
  }
  const table = value && typeof value === "object" ? value : {};
  const hints = {depth: "along the stave's width", apex_height: "above the inner face (or give apex_fraction)",
                 apex_fraction: "of the thickness, 0 to 1 (or give apex_height)"};
  for (const k of NOTCH_KEYS) {
    const full = `${key}.${k}`;
    box.append(fieldRow(full, k.replace("_", " "), textInput(full, table[k]), hints[k]));
  }
  return box;
}

function plugsInput(key, value) {
  const box = el("div", {class: "plugs", id: "f-" + key, "data-key": key});
  const plugs = Array.isArray(value) ? value : [];
  plugs.forEach((plug, i) => {
    const base = `${key}[${i + 1}]`;
    const row = el("div", {class: "plug", "data-key": base},
      el("span", {class: "plug-number", text: `${i + 1}`}),
      fieldRow(`${base}.from`, "from", textInput(`${base}.from`, plug.from)),
      fieldRow(`${base}.to`, "to", textInput(`${base}.to`, plug.to)),
      fieldRow(`${base}.wood`, "wood", woodInput(`${base}.wood`, plug.wood, {plug: true})),
      el("button", {type: "button", class: "small", text: "remove", title: "remove this plug",
        onclick: () => queue({delete: base}, {rebuild: true, now: true})}));
    for (const k of Object.keys(plug)) {
      if (!["from", "to", "wood"].includes(k)) row.append(fieldRow(`${base}.${k}`, k, textInput(`${base}.${k}`, plug[k])));
    }
    box.append(row);
  });
  box.append(el("button", {type: "button", class: "small", text: "+ plug",
    onclick: () => queue({append: key, value: {from: "", to: ""}}, {rebuild: true, now: true})}));
  return box;
}

function controlFor(field, key, value, table) {
  const choices = state.start.choices;
  switch (field.kind) {
    case "text": return textInput(key, value, {string: true});
    case "choice": return choiceInput(key, value, choices[field.choices] || [],
      {optional: field.optional, rebuild: field.key === "joint" || field.key === "units",
       extra: field.key === "joint" ? (v) => { if (v !== "birdsmouth-custom") queue({delete: "hollow.notch"}); } : null});
    case "list": return listInput(key, value);
    case "pairs": return pairsInput(key, value, field.cols);
    case "bool": {
      const box = el("input", {type: "checkbox", id: "f-" + key, "data-key": key});
      box.checked = value === true;
      box.addEventListener("change", () => setValue(key, box.checked, {now: true}));
      return box;
    }
    case "wood": return woodInput(key, value);
    case "wall": return wallInput(key, value);
    case "diameters": return diametersInput(key, value);
    case "staves": {
      const input = textInput(key, value, {placeholder: "8, or auto"});
      input.setAttribute("list", "staves-choices");
      return input;
    }
    case "notch": return notchInput(key, value, table.joint);
    case "plugs": return plugsInput(key, value);
    default: return textInput(key, value, {placeholder: field.optional ? "(default)" : ""});
  }
}

function buildForm() {
  const form = $("form");
  form.replaceChildren();
  const data = state.data;
  if (data === null) {
    form.append(el("p", {class: "hint", text: "The file cannot be read as TOML: fix it in “The spar file as text”."}));
    $("raw-panel").open = true;
    return;
  }
  const known = new Set(SCHEMA.map((g) => g.table));
  for (const group of SCHEMA) {
    const table = data[group.table];
    const present = table !== undefined && table !== null && typeof table === "object";
    const values = present ? table : {};
    const set = el("fieldset", {"data-key": group.table, id: "group-" + group.table},
      el("legend", {text: `${group.title}  [${group.table}]`}),
      el("div", {class: "msg", "data-msg-for": group.table}));
    if (!present && group.optional) {
      set.append(el("p", {class: "hint", text: `No [${group.table}] table in the file: fill a field to add one.`}));
    } else if (group.optional) {
      set.append(el("button", {type: "button", class: "small remove-table", text: `remove [${group.table}]`,
        onclick: () => queue({delete: group.table}, {rebuild: true, now: true})}));
    }
    const names = new Set();
    for (const field of group.fields) {
      names.add(field.key);
      const key = `${group.table}.${field.key}`;
      const control = controlFor(field, key, values[field.key], values);
      set.append(field.kind === "plugs" || field.kind === "notch"
        ? el("div", {class: "field block", "data-field": key}, el("div", {class: "block-label", text: field.label}),
             control, el("div", {class: "msg", "data-msg-for": key}))
        : fieldRow(key, field.label, control, field.hint));
    }
    for (const k of Object.keys(values)) {
      if (!names.has(k)) set.append(fieldRow(`${group.table}.${k}`, k, textInput(`${group.table}.${k}`, values[k])));
    }
    form.append(set);
  }
  for (const [name, table] of Object.entries(data)) {
    if (known.has(name)) continue;
    const set = el("fieldset", {"data-key": name}, el("legend", {text: `[${name}]`}),
      el("div", {class: "msg", "data-msg-for": name}));
    if (table && typeof table === "object" && !Array.isArray(table)) {
      for (const [k, v] of Object.entries(table)) set.append(fieldRow(`${name}.${k}`, k, textInput(`${name}.${k}`, v)));
    } else {
      set.append(fieldRow(name, name, textInput(name, table)));
    }
    form.append(set);
  }
  form.append(el("datalist", {id: "staves-choices"}, el("option", {value: "auto"})));
}

// ---- messages ----------------------------------------------------------------------------------

function clearMessages() {
  for (const node of document.querySelectorAll(".msg")) node.textContent = "";
  for (const node of document.querySelectorAll(".bad")) node.classList.remove("bad");
  for (const node of document.querySelectorAll("[aria-invalid]")) node.removeAttribute("aria-invalid");
}

// The message goes beside the field its key names: the key itself, or the nearest table or list
// that holds it ("hollow.plug[2].from" → that field; "plan.stations[3]" → the diameters, row 3 marked).
function showMessage(key, message) {
  let k = key || "";
  const exact = document.querySelector(`[data-key="${CSS.escape(k)}"]`);
  if (exact) { exact.classList.add("bad"); exact.setAttribute("aria-invalid", "true"); }
  while (true) {
    const spot = document.querySelector(`.msg[data-msg-for="${CSS.escape(k)}"]`);
    if (spot) { spot.textContent = message; return spot; }
    if (k === "") return null;
    const shorter = k.replace(/(\[\d+\]|\.[^.\[]+)$/, "");
    k = shorter === k ? "" : shorter;
    const holder = document.querySelector(`[data-key="${CSS.escape(k)}"]`);
    if (holder && !exact) holder.classList.add("bad");
  }
}

// ---- results -----------------------------------------------------------------------------------

function fillTable(node, data, rowClass = () => "") {
  node.replaceChildren();
  if (!data) return;
  const head = el("tr");
  for (const h of data.headers) head.append(el("th", {text: h}));
  node.append(el("thead", {}, head));
  const body = el("tbody");
  data.rows.forEach((row, i) => {
    const tr = el("tr", {class: rowClass(data.styles ? data.styles[i] : "", i) || null});
    for (const cell of row) tr.append(el("td", {text: cell}));
    body.append(tr);
  });
  node.append(body);
}

function fillPairs(node, rows) {
  node.replaceChildren();
  for (const [label, value, heading] of rows) {
    node.append(el("tr", {class: heading ? "heading" : null}, el("th", {text: label}), el("td", {text: value})));
  }
}

function renderDoc(doc) {
  state.doc = doc;
  const c = doc.check;
  const box = $("verdict");
  box.className = "verdict " + (c.passed ? "pass" : "fail");
  box.replaceChildren(
    el("strong", {text: c.passed ? "PASS" : "FAIL"}),
    el("span", {text: ` least EI ratio ${c.min_ei_ratio.toFixed(3)} (target ${c.ei_target.toFixed(3)})`}),
    el("span", {text: ` · least strength ratio ${c.min_strength_ratio.toFixed(3)}` +
      (c.strength_target ? ` (target ${c.strength_target.toFixed(3)})` : "")}));
  box.dataset.passed = String(c.passed);
  box.dataset.minEiRatio = String(c.min_ei_ratio);
  const cautions = $("cautions");
  cautions.replaceChildren(...doc.cautions.map((t) => el("li", {text: t})));
}

function renderView(view) {
  state.view = view;
  $("verdict-words").textContent = view.verdict;
  const notes = $("notes");
  notes.replaceChildren(...view.solved.map((t) => el("li", {class: "solved", text: "solved: " + t})),
                        ...view.warnings.map((t) => el("li", {class: "warning", text: "warning: " + t})));
  fillTable($("stations"), view.stations, (style) =>
    style.includes("yellow") ? "least" : (style.includes("red") ? "short" : ""));
  fillTable($("whole"), view.whole);
  const station = $("station");
  const chosen = station.value;
  station.replaceChildren(...view.positions.map((p) =>
    el("option", {value: `${p.z_mm} mm`, text: `${p.label}  (${p.reasons.join(", ")})`})));
  if ([...station.options].some((o) => o.value === chosen)) station.value = chosen;
  else station.value = `${view.weakest_z_mm} mm`;
  if (view.stave_svg) { $("stave-length").innerHTML = view.stave_svg; $("stave-panel").hidden = false; }
  else $("stave-panel").hidden = true;
  const order = view.order;
  $("order-panel").hidden = !order;
  if (order) {
    $("order-summary").textContent = order.summary;
    fillTable($("order"), order);
    $("order-notes").replaceChildren(...order.notes.map((t) => el("li", {text: t})));
    $("boards-svg").innerHTML = order.svg;
  }
}

function renderSection(sec) {
  $("section-title").textContent = `${sec.figures.title}`;
  $("section-svg").innerHTML = sec.section_svg;
  $("stave-svg").innerHTML = sec.stave_svg;
  fillPairs($("figures"), sec.figures.rows.map((r) => [r[0], r[1], false]));
  fillPairs($("cutter"), sec.cutter.map((r) => [r.label, r.value, r.heading]));
}

function sectionAt() {
  const typed = $("at").value.trim();
  if (typed) return typed;
  if (state.at) return state.at;
  return state.doc ? `${state.doc.check.min_ei_ratio_z_mm} mm` : "0";
}

async function refresh() {
  const seq = ++state.seq;
  const text = state.text;
  const asked = performance.now();
  const check = await post("/api/check" + query(), text);
  if (seq !== state.seq) return;
  clearMessages();
  if (!check.ok) {
    showMessage(check.body.key || "", check.body.message);
    finishUpdate(seq, false, asked);
    return;
  }
  renderDoc(check.body);
  const [view, sec] = await Promise.all([
    post("/api/view" + query(), text),
    post("/api/section" + query({at: sectionAt()}), text),
  ]);
  if (seq !== state.seq) return;
  if (view.ok) renderView(view.body); else showMessage(view.body.key || "", view.body.message);
  if (sec.ok) renderSection(sec.body); else showMessage(sec.body.key || "", sec.body.message);
  finishUpdate(seq, true, asked);
}

async function refreshSection() {
  const seq = state.seq;
  const sec = await post("/api/section" + query({at: sectionAt()}), state.text);
  if (seq !== state.seq) return;
  for (const n of document.querySelectorAll('.msg[data-msg-for="at"]')) n.textContent = "";
  $("at").classList.remove("bad");
  if (sec.ok) renderSection(sec.body); else showMessage(sec.body.key || "", sec.body.message);
  finishUpdate(seq, sec.ok, null);
}

// Each finished update is counted on <body data-updates> and timed: from the keystroke that caused it
// (the debounce included) and from the first request, to the last drawing on the page.
function finishUpdate(seq, ok, asked) {
  const now = performance.now();
  state.updates += 1;
  window.stavegenTimings.push({
    ok, afterKeystrokeMs: state.lastKeyAt === null ? null : now - state.lastKeyAt,
    afterRequestMs: asked === null ? null : now - asked,
  });
  state.lastKeyAt = null;
  document.body.dataset.updates = String(state.updates);
  document.body.dataset.ok = String(ok);
  if (state.boat && state.boat.current !== null) {
    state.boat.spars[state.boat.current] = state.text;
    scheduleBoatCheck();
  }
  if (seq === state.seq && state.timer === null && state.pending.size === 0) document.body.dataset.busy = "0";
}

// ---- files -----------------------------------------------------------------------------------------

function syncRaw() {
  const raw = $("raw");
  if (document.activeElement !== raw) raw.value = state.text;
}

function loadFile(text, name, {inBoat = false} = {}) {
  if (!inBoat) leaveBoat();
  state.text = text;
  state.name = name;
  state.at = "";
  $("at").value = "";
  $("file-name").textContent = name;
  clearTimeout(state.timer);
  state.timer = null;
  state.pending.clear();
  document.body.dataset.busy = "1";
  syncRaw();
  state.chain = state.chain.then(() => applyEdits([], true));
}

function baseName(name) {
  const parts = name.split(/[\\/]/);
  return parts[parts.length - 1] || "spar.toml";
}

function download(blob, filename) {
  const url = URL.createObjectURL(blob);
  const a = el("a", {href: url, download: filename});
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10000);
}

async function downloadZip() {
  const status = $("zip-status");
  status.textContent = "writing every output…";
  const answer = await post("/api/build?" + new URLSearchParams({name: state.name}), state.text);
  if (!answer.ok) {
    status.textContent = "";
    clearMessages();
    showMessage(answer.body.key || "", answer.body.message);
    return;
  }
  const disposition = answer.response.headers.get("Content-Disposition") || "";
  const match = /filename="([^"]+)"/.exec(disposition);
  download(answer.body, match ? match[1] : "stavegen-outputs.zip");
  status.textContent = "downloaded " + (match ? match[1] : "the zip");
}

async function compareCounts() {
  const status = $("compare-status");
  status.textContent = "laying out every stave count…";
  $("compare").disabled = true;
  try {
    const answer = await post("/api/size?" + new URLSearchParams({name: state.name}), state.text);
    status.textContent = "";
    const spot = document.querySelector('.msg[data-msg-for="hollow.staves.compare"]');
    spot.textContent = "";
    if (!answer.ok) {
      $("compare-reason").replaceChildren();
      $("compare-table").replaceChildren();
      $("compare-notes").replaceChildren();
      spot.textContent = answer.body.message;
      return;
    }
    const s = answer.body;
    $("compare-reason").replaceChildren(el("strong", {text: "choice: "}), el("span", {id: "compare-words", text: s.reason}),
      s.asked !== s.chosen ? el("button", {type: "button", class: "small use-count", text: `use ${s.chosen} staves`,
        onclick: () => setValue("hollow.staves", String(s.chosen), {rebuild: true, now: true})}) : "");
    fillTable($("compare-table"), s.table, (style, i) =>
      i === s.chosen_row ? "chosen" : (style.includes("dim") ? "dim" : ""));
    $("compare-notes").replaceChildren(...s.notes.map((t) => el("li", {text: t})));
  } finally {
    $("compare").disabled = false;
  }
}

// ---- a boat: several spar files and one order -------------------------------------------------------------

function loadBoat(boat) {
  state.boat = {text: boat.text, name: boat.name, spars: {...boat.spars}, current: null,
                seq: 0, timer: null, doc: null};
  $("boat-bar").hidden = false;
  $("boat-name").textContent = boat.name;
  $("boat-spars").replaceChildren();
  document.body.dataset.boatUpdates = "0";
  openBoatSpar(Object.keys(boat.spars)[0]);
}

function leaveBoat() {
  if (!state.boat) return;
  clearTimeout(state.boat.timer);
  state.boat = null;
  $("boat-bar").hidden = true;
  $("boat-msg").textContent = "";
}

function openBoatSpar(file) {
  const boat = state.boat;
  if (boat.current !== null) boat.spars[boat.current] = state.text;
  boat.current = file;
  renderBoatTabs();
  loadFile(boat.spars[file], file, {inBoat: true});
}

function renderBoatTabs() {
  // The tabs are made once per boat and then only re-labelled, so a click never lands on a replaced button.
  const boat = state.boat;
  const verdicts = new Map();
  if (boat.doc) for (const s of boat.doc.boat.spars) verdicts.set(s.file, s);
  const bar = $("boat-spars");
  const files = Object.keys(boat.spars);
  if ([...bar.children].map((b) => b.dataset.file).join("\n") !== files.join("\n")) {
    bar.replaceChildren(...files.map((file) => el("button", {type: "button", role: "tab", "data-file": file,
      title: file, onclick: () => { if (file !== state.boat.current) openBoatSpar(file); }})));
  }
  for (const button of bar.children) {
    const file = button.dataset.file;
    const known = verdicts.get(file);
    button.setAttribute("aria-selected", String(file === boat.current));
    if (known) button.dataset.passed = String(known.passed); else delete button.dataset.passed;
    button.textContent = known ? `${known.tag} · ${known.name}` : file;
  }
}

function scheduleBoatCheck() {
  const boat = state.boat;
  clearTimeout(boat.timer);
  document.body.dataset.boatBusy = "1";
  boat.timer = setTimeout(() => { boat.timer = null; boatCheck(); }, DEBOUNCE_MS);
}

function boatRequest() {
  const boat = state.boat;
  return JSON.stringify({boat: boat.text, spars: boat.spars});
}

async function boatCheck() {
  const boat = state.boat;
  if (!boat) return;
  const seq = ++boat.seq;
  const answer = await post("/api/boat/check?" + new URLSearchParams({name: boat.name, layout: "1"}),
                            boatRequest(), "application/json");
  if (state.boat !== boat || seq !== boat.seq) return;
  const verdict = $("boat-verdict");
  if (!answer.ok) {
    $("boat-msg").textContent = answer.body.message;
    verdict.textContent = "";
    verdict.className = "boat-verdict";
    $("boat-summary").textContent = "";
  } else {
    $("boat-msg").textContent = "";
    boat.doc = answer.body;
    const passed = boat.doc.boat.passed;
    verdict.className = "boat-verdict " + (passed ? "pass" : "fail");
    verdict.textContent = passed ? "the boat: PASS" : "the boat: FAIL";
    verdict.dataset.passed = String(passed);
    const stock = boat.doc.stock;
    $("boat-summary").textContent = stock
      ? `one order: ${stock.board_feet.toFixed(2)} board feet to buy; ` +
        `${stock.separate_board_feet.toFixed(2)} if each spar were bought alone`
      : "no [stock] in the boat file: no board order";
    renderBoatTabs();
  }
  document.body.dataset.boatUpdates = String(Number(document.body.dataset.boatUpdates || 0) + 1);
  if (boat.timer === null) document.body.dataset.boatBusy = "0";  // the answer is for the texts as they stand
}

async function downloadBoatZip() {
  const boat = state.boat;
  const status = $("boat-status");
  boat.spars[boat.current] = state.text;
  status.textContent = "writing the boat's papers…";
  const answer = await post("/api/boat/build?" + new URLSearchParams({name: boat.name}), boatRequest(),
                            "application/json");
  if (!answer.ok) {
    status.textContent = "";
    $("boat-msg").textContent = answer.body.message;
    return;
  }
  const disposition = answer.response.headers.get("Content-Disposition") || "";
  const match = /filename="([^"]+)"/.exec(disposition);
  download(answer.body, match ? match[1] : "stavegen-boat.zip");
  status.textContent = "downloaded " + (match ? match[1] : "the zip");
}

// ---- start -------------------------------------------------------------------------------------------

async function main() {
  const start = await (await fetch("/api/start")).json();
  state.start = start;
  for (const name of start.samples) $("samples").append(el("option", {value: name, text: name}));
  for (const name of start.boats) $("samples").append(el("option", {value: name, text: name + " (a boat)"}));
  $("samples").addEventListener("change", async (e) => {
    const name = e.target.value;
    if (!name) return;
    const answer = await (await fetch("/api/sample/" + encodeURIComponent(name))).json();
    e.target.value = "";
    if (answer.boat) loadBoat(answer.boat); else loadFile(answer.text, answer.name);
  });
  $("open-file").addEventListener("change", (e) => {
    const file = e.target.files[0];
    if (!file) return;
    const reader = new FileReader();
    reader.onload = () => loadFile(String(reader.result), file.name);
    reader.readAsText(file);
    e.target.value = "";
  });
  $("download-toml").addEventListener("click", () =>
    download(new Blob([state.text], {type: "application/toml"}), baseName(state.name)));
  $("download-zip").addEventListener("click", downloadZip);
  $("compare").addEventListener("click", compareCounts);
  $("station").addEventListener("change", (e) => { state.at = e.target.value; $("at").value = ""; refreshSection(); });
  let atTimer = null;
  $("at").addEventListener("input", () => {
    state.lastKeyAt = performance.now();
    document.body.dataset.busy = "1";
    clearTimeout(atTimer);
    atTimer = setTimeout(refreshSection, DEBOUNCE_MS);
  });
  let rawTimer = null;
  $("raw").addEventListener("input", (e) => {
    state.lastKeyAt = performance.now();
    document.body.dataset.busy = "1";
    clearTimeout(rawTimer);
    rawTimer = setTimeout(() => {
      state.text = e.target.value;
      state.chain = state.chain.then(() => applyEdits([], true));
    }, DEBOUNCE_MS);
  });
  $("download-boat-toml").addEventListener("click", () =>
    download(new Blob([state.boat.text], {type: "application/toml"}), baseName(state.boat.name)));
  $("download-boat-zip").addEventListener("click", downloadBoatZip);
  if (start.boat) loadBoat(start.boat); else loadFile(start.text, start.name);
}

main();
