// The workbench page: one state from the server, drawn into the top bar, the diagram,
// the list of parts, the selected part's form and the findings.

import { ApiError, EditQueue, getJSON, postJSON } from "./api.js";
import { renderDiagram, showSelected } from "./diagram.js";
import { debounce, h } from "./dom.js";
import { renderFindings } from "./findings.js";
import { FormView, elementsOf, findElement, renderNav } from "./forms.js";
import { ScheduleGrid } from "./schedule.js";

const $ = (id) => document.getElementById(id);

const page = {
  state: null,
  selected: { kind: "project", index: 0 },
  view: { showOk: false },
  busy: false,
  grid: null,
  editedSchedules: new Set(),
  textArea: null,
};

const queue = new EditQueue({
  onState: applyState,
  onBusy: (busy) => {
    page.busy = busy;
    paintStatus();
  },
  onError: showError,
});

function model() {
  const st = page.state || {};
  return { schema: st.schema, elements: st.elements, results: st.results, pendingKeys: queue.pendingKeys() };
}

const form = new FormView($("editor"), {
  onEdit: (kind, index, key, value) => queue.set(kind, index, key, value),
  onCommit: () => queue.flush(),
  onRemove: removeElement,
  onAdd: addElement,
  extras: addScheduleGrid,
});

// ---------------------------------------------------------------- state

function applyState(state) {
  if (!state.schema && page.state) state.schema = page.state.schema; // the schema never changes
  page.state = state;
  paintTop();
  paintStatus();
  if (page.selected.kind !== "__text__" && !findElement(model(), page.selected.kind, page.selected.index)) {
    const same = elementsOf(model(), page.selected.kind);
    if (!same.length) page.selected = { kind: "project", index: 0 };
    else page.selected = { kind: page.selected.kind, index: same[same.length - 1].index };
  }
  const textOnly = state.job && state.job.form_edits === false;
  if (textOnly && !page.textOnly) {
    if (page.selected.kind !== "__text__") showText();
    notice(`The forms are off until the job file text is fixed: ${state.job.text_only_reason || "it cannot be read as tables"}. Edit the text below.`, "error");
  } else if (!textOnly && page.textOnly) $("notice").hidden = true;
  page.textOnly = textOnly;
  paintNav();
  paintEditor();
  paintResults();
  if (page.grid) page.grid.refresh();
}

function paintTop() {
  const job = page.state.job || {};
  $("job-name").textContent = job.name || "(new job)";
  $("job-name").title = job.exists ? "The job file this page edits" : "Not saved yet: Save creates the file";
  const dirty = job.dirty || !job.exists || page.editedSchedules.size > 0;
  $("job-dirty").hidden = !dirty;
  document.title = `${dirty ? "• " : ""}${job.name || "new job"} — feedcheck workbench`;
}

function paintStatus() {
  const line = $("status-line");
  const results = page.state && page.state.results;
  line.className = "statusline";
  if (!results) {
    line.textContent = page.busy ? "checking…" : "loading…";
    return;
  }
  let text;
  if (results.valid === false) {
    const n = (results.input_errors || []).length;
    text = `${n} input error${n === 1 ? "" : "s"}: not checked`;
    line.classList.add("st-error");
  } else {
    const c = results.counts || {};
    text = `${c.fail || 0} fail · ${c.warn || 0} warn · ${c.info || 0} info · ${c.ok || 0} ok`;
    if (c.fail) line.classList.add("st-fail");
    else if (c.warn) line.classList.add("st-warn");
    else line.classList.add("st-ok");
  }
  if (page.busy) text += " · checking…";
  else if (results.valid !== false && typeof results.elapsed_ms === "number") text += ` · checked in ${results.elapsed_ms} ms`;
  line.textContent = text;
  line.title = text;
}

function paintNav() {
  if (page.textOnly) {
    $("elements").replaceChildren(
      h("p", { class: "nav-note" }, "The forms return once the job file text reads as tables."),
      h("button", { type: "button", class: "nav-item nav-text current", onclick: showText }, "Job file text"),
    );
    return;
  }
  renderNav($("elements"), model(), page.selected, {
    onSelect: (kind, index) => select(kind, index),
    onAdd: addElement,
    onText: showText,
  });
}

function paintEditor() {
  if (page.selected.kind === "__text__") {
    if (page.textArea && document.activeElement !== page.textArea && !page.textEdited) page.textArea.value = page.state.text || "";
    return;
  }
  form.show(model(), page.selected);
}

/** The diagram's mark on the selected part: its node, or a run's label and what it feeds. */
function paintSelected() {
  const element = findElement(model(), page.selected.kind, page.selected.index);
  const id = element && element.id;
  if (page.selected.kind === "source") return showSelected($("diagram"), "source", null);
  if (page.selected.kind === "run") {
    const fed = ((page.state.results && page.state.results.nodes) || []).find((n) => n.via === id);
    return showSelected($("diagram"), fed ? fed.id : null, id);
  }
  showSelected($("diagram"), id, null);
}

function paintResults() {
  const results = page.state.results;
  renderDiagram($("diagram"), results, { onNode: openNode, onRun: (id) => openById("run", id) });
  paintSelected();
  renderFindings($("findings"), results, page.view, {
    onGo: goTo,
    onToggleOk: () => {
      page.view.showOk = !page.view.showOk;
      paintResults();
    },
  });
}

// ---------------------------------------------------------------- navigation

function select(kind, index, force = false) {
  const changed = page.selected.kind !== kind || page.selected.index !== index;
  page.selected = { kind, index };
  page.textArea = null;
  $("editor").classList.remove("text-mode");
  if (changed && page.grid) page.grid = null;
  paintNav();
  form.show(model(), page.selected, force || changed);
  paintSelected();
}

function openById(kind, id) {
  const element = elementsOf(model(), kind).find((e) => e.id === id);
  if (element) select(kind, element.index);
  form.focusField(null);
}

function openNode(node) {
  if (node.kind === "source") select("source", 0);
  else {
    const element = (page.state.elements || []).find((e) => e.id === node.id && e.kind === node.kind) || (page.state.elements || []).find((e) => e.id === node.id);
    if (!element) return;
    select(element.kind, element.index);
  }
  form.focusField(null);
  $("editor").scrollTop = 0;
}

/** Show the job file text with line n (1 = the first) selected. */
function showLine(n) {
  if (page.selected.kind !== "__text__") showText();
  const area = page.textArea;
  const lines = area.value.split("\n");
  const start = lines.slice(0, n - 1).reduce((sum, line) => sum + line.length + 1, 0);
  area.focus();
  area.setSelectionRange(start, start + (lines[n - 1] || "").length);
  const lineHeight = parseFloat(getComputedStyle(area).lineHeight) || 18;
  area.scrollTop = Math.max(0, (n - 5) * lineHeight);
}

async function goTo(target) {
  if (!target.kind || page.textOnly) return target.line ? showLine(target.line) : showText();
  select(target.kind, target.index);
  const circuit = target.subject && target.subject.includes("/") ? target.subject.split("/").slice(1).join("/") : null;
  if ((circuit || target.row) && page.grid) {
    const grid = page.grid;
    await grid.ready;
    // a schedule's row as the spreadsheet numbers it: the header is row 1
    if (target.row && grid.showRow(target.row - 2)) return;
    if (circuit && grid.showCircuit(circuit)) return;
  }
  form.focusField(target.key);
}

// ---------------------------------------------------------------- editing

async function addElement(kind) {
  await queue.op({ op: "add", kind });
  const all = elementsOf(model(), kind);
  if (all.length) select(kind, all[all.length - 1].index, true);
}

async function removeElement(kind, element) {
  const name = element.id || `${kind.title} #${element.index + 1}`;
  if (!window.confirm(`Remove ${name} from the job? (The file changes only when you save.)`)) return;
  await queue.op({ op: "remove", kind: kind.kind, index: element.index });
  page.selected = { kind: "project", index: 0 };
  select("project", 0, true);
}

function addScheduleGrid(root, mdl, kind, element) {
  if (kind.kind !== "panel" || !element.values || !element.values.schedule || !element.id) {
    page.grid = null;
    return;
  }
  const holder = h("section", { class: "schedule", id: "schedule" });
  root.append(holder);
  const grid = new ScheduleGrid(holder, element.id, {
    onState: (state) => queue.accept(state),
    onError: showError,
    onEdited: (panel) => {
      page.editedSchedules.add(panel);
      paintTop();
    },
  });
  page.grid = grid;
  grid.ready = grid.load();
}

function showText() {
  page.selected = { kind: "__text__", index: 0 };
  page.grid = null;
  page.textEdited = false;
  paintNav();
  const area = h("textarea", { id: "job-text", spellcheck: "false", "aria-label": "The job file (TOML)" });
  area.value = page.state.text || "";
  // the text is checked as it is typed, like the forms (a little slower: whole document)
  const send = debounce(async () => {
    const text = area.value;
    await queue.op({ op: "text", text });
    if (area.value === text) page.textEdited = false;
  }, 600);
  area.addEventListener("input", () => {
    page.textEdited = true;
    send();
  });
  area.addEventListener("blur", () => {
    if (page.textEdited) send.now();
  });
  page.textArea = area;
  $("editor").classList.add("text-mode");
  $("editor").replaceChildren(
    h("div", { class: "form-head" }, h("h2", {}, "Job file text")),
    h(
      "p",
      { class: "muted" },
      "The whole job file as it is saved, comments included. It is checked as you type, like the forms.",
    ),
    area,
  );
  form.shown = null;
}

// ---------------------------------------------------------------- actions

function notice(text, kind = "info", link = null) {
  const box = $("notice");
  clearTimeout(page.noticeTimer);
  // a plain confirmation goes by itself; errors and a download link stay until dismissed
  if (kind === "ok" && !link) page.noticeTimer = setTimeout(() => (box.hidden = true), 8000);
  box.className = `notice notice-${kind}`;
  box.replaceChildren(...[h("span", {}, text), link, h("button", { type: "button", class: "quiet", onclick: () => (box.hidden = true) }, "dismiss")].filter(Boolean));
  box.hidden = false;
}

function showError(err) {
  if (err instanceof ApiError) {
    const errors = err.body.errors || [];
    const lines = errors.map((e) => (typeof e === "string" ? e : e.message)).filter(Boolean);
    notice([err.message, ...lines].join("\n"), "error");
  } else notice(`The workbench server does not answer (${err.message}). Is \`feedcheck edit\` still running?`, "error");
}

/** Everything typed reaches the server before a save or a report. */
async function flushAll() {
  await queue.flush();
  if (page.grid) await page.grid.flush();
}

async function save() {
  await flushAll();
  try {
    const done = await postJSON("api/save", {});
    const saved = [done.saved];
    for (const panel of [...page.editedSchedules]) {
      const sched = await postJSON("api/schedule/save", { panel });
      saved.push(sched.saved);
      page.editedSchedules.delete(panel);
    }
    page.state.job = { ...page.state.job, ...(done.job || { dirty: false, exists: true }) };
    paintTop();
    notice(`Saved ${saved.join(", ")}.`, "ok");
    return true;
  } catch (err) {
    showError(err);
    return false;
  }
}

function unsaved() {
  const job = page.state && page.state.job;
  return Boolean((job && (job.dirty || !job.exists)) || page.editedSchedules.size);
}

async function report() {
  await flushAll();
  if (unsaved()) {
    const ok = window.confirm("The report is written from the saved files. Save your changes now and write the report?");
    if (!ok) return;
    if (!(await save())) return;
  }
  const button = $("btn-report");
  button.disabled = true;
  notice("Writing the report…", "info");
  try {
    const done = await postJSON("api/report", {});
    const link = h("a", { href: done.url, download: done.file, id: "report-link" }, `Download ${done.file}`);
    notice(`Report written next to the job: ${done.file}.`, "ok", link);
    link.click();
  } catch (err) {
    showError(err);
  } finally {
    button.disabled = false;
  }
}

function newJob() {
  const dialog = $("new-dialog");
  $("new-error").hidden = true;
  $("new-unsaved").hidden = !unsaved();
  dialog.showModal();
  $("new-name").select();
}

async function createJob(event) {
  event.preventDefault();
  await flushAll();
  try {
    const state = await postJSON("api/new", { name: $("new-name").value.trim() });
    $("new-dialog").close();
    page.editedSchedules.clear();
    page.selected = { kind: "project", index: 0 };
    queue.accept(state);
    select("project", 0, true);
    notice(`Started ${state.job.name} from the template.`, "ok");
  } catch (err) {
    $("new-error").textContent = err.message;
    $("new-error").hidden = false;
  }
}

// ---------------------------------------------------------------- start

function wire() {
  $("btn-save").addEventListener("click", save);
  $("btn-report").addEventListener("click", report);
  $("btn-new").addEventListener("click", newJob);
  $("new-form").addEventListener("submit", createJob);
  $("new-cancel").addEventListener("click", () => $("new-dialog").close());
  document.addEventListener("keydown", (e) => {
    if ((e.ctrlKey || e.metaKey) && e.key === "s") {
      e.preventDefault();
      save();
    }
  });
  setInterval(() => postJSON("api/ping", {}).catch(() => {}), 20000);
  window.addEventListener("pagehide", () => {
    fetch("api/bye", { method: "POST", headers: { "Content-Type": "application/json" }, body: "{}", keepalive: true }).catch(() => {});
  });
  window.addEventListener("beforeunload", (e) => {
    if (unsaved()) e.preventDefault();
  });
}

async function start() {
  wire();
  try {
    queue.accept(await getJSON("api/state"));
    select("project", 0, true);
    document.body.dataset.ready = "true";
  } catch (err) {
    showError(err);
  }
}

start();
