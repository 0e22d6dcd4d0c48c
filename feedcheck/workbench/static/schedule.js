// A panel's schedule as an editable grid: one input per cell, the checked status of each
// circuit in its row, paste from a spreadsheet (tab-separated text) at any cell.

import { getJSON, postJSON } from "./api.js";
import { badge, debounce, h } from "./dom.js";

/** Tab-separated clipboard text → rows of cells (quoted cells as spreadsheets write them). */
export function parseTabText(text) {
  const rows = [];
  let row = [];
  let cell = "";
  let quoted = false;
  for (let i = 0; i < text.length; i += 1) {
    const c = text[i];
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') {
        cell += '"';
        i += 1;
      } else if (c === '"') quoted = false;
      else cell += c;
    } else if (c === '"' && cell === "") quoted = true;
    else if (c === "\t") {
      row.push(cell);
      cell = "";
    } else if (c === "\n" || c === "\r") {
      if (c === "\r" && text[i + 1] === "\n") i += 1;
      row.push(cell);
      rows.push(row);
      row = [];
      cell = "";
    } else cell += c;
  }
  if (cell !== "" || row.length) {
    row.push(cell);
    rows.push(row);
  }
  return rows;
}

function sameText(a, b) {
  return a.trim().toLowerCase() === b.trim().toLowerCase();
}

export class ScheduleGrid {
  constructor(root, panel, { onState, onError, onEdited }) {
    this.root = root;
    this.panel = panel;
    this.onState = onState;
    this.onError = onError;
    this.onEdited = onEdited;
    this.data = null;
    this.inputs = [];
    this.statusCells = [];
    this.sending = false;
    this.send = debounce(() => this.post(), 400);
  }

  async load() {
    try {
      this.data = await getJSON(`api/schedule?panel=${encodeURIComponent(this.panel)}`);
      if (this.data.edited) this.onEdited(this.panel);
    } catch (err) {
      this.root.replaceChildren(h("p", { class: "muted" }, `Schedule: ${err.message}`));
      return false;
    }
    this.render();
    return true;
  }

  /** The job changed elsewhere: fetch the statuses again unless the user is editing here. */
  async refresh() {
    if (!this.data) {
      await this.load(); // it could not be read before (the job had input errors)
      return;
    }
    if (this.sending || this.root.contains(document.activeElement)) return;
    try {
      const fresh = await getJSON(`api/schedule?panel=${encodeURIComponent(this.panel)}`);
      if (fresh.rows.length === this.data.rows.length) {
        this.data.status = fresh.status;
        this.data.messages = fresh.messages;
        this.paintStatus();
      }
    } catch {
      // the next edit shows the error
    }
  }

  render() {
    const { columns, rows, file } = this.data;
    this.inputs = [];
    this.statusCells = [];
    this.widths = columns.map((c, i) => Math.min(30, Math.max(4, c.length, ...rows.map((r) => String(r[i] ?? "").length)) + 1));
    const head = h(
      "tr",
      {},
      h("th", { class: "rownum" }, "#"),
      h("th", { scope: "col", class: "status-col" }, "Status"),
      columns.map((c) => h("th", { scope: "col" }, c)),
      h("th", { scope: "col" }, "Check"),
      h("th", {}, ""),
    );
    const body = rows.map((cells, r) => this.rowElement(cells, r, columns.length));
    const table = h("table", { class: "grid", id: `grid-${this.panel}` }, h("thead", {}, head), h("tbody", {}, body));
    table.addEventListener("paste", (e) => this.paste(e));
    this.note = h("p", { class: "grid-note", role: "status" });
    this.root.replaceChildren(
      h(
        "div",
        { class: "grid-head" },
        h("h3", {}, `Circuits (${file})`),
        h("span", { class: "muted" }, "Paste rows copied from a spreadsheet into any cell."),
        h("button", { type: "button", class: "quiet", onclick: () => this.addRow() }, "Add row"),
      ),
      h("div", { class: "grid-scroll" }, table),
      this.note,
    );
    this.paintStatus();
  }

  rowElement(cells, r, width) {
    const inputs = [];
    const tds = [];
    for (let c = 0; c < width; c += 1) {
      const input = h("input", {
        type: "text",
        spellcheck: "false",
        size: this.widths[c],
        "aria-label": `${this.data.columns[c]}, row ${r + 1}`,
        dataset: { row: String(r), col: String(c) },
      });
      input.value = cells[c] ?? "";
      input.addEventListener("input", () => {
        this.data.rows[r][c] = input.value;
        this.unsent = true;
        this.send();
      });
      inputs.push(input);
      tds.push(h("td", {}, input));
    }
    this.inputs[r] = inputs;
    const status = h("td", { class: "status-cell" });
    const message = h("td", { class: "message-cell" });
    this.statusCells[r] = [status, message];
    const remove = h("button", { type: "button", class: "quiet row-remove", title: `Remove row ${r + 1}`, "aria-label": `Remove row ${r + 1}`, onclick: () => this.removeRow(r) }, "×");
    return h("tr", { dataset: { row: String(r) } }, h("td", { class: "rownum" }, String(r + 1)), status, tds, message, h("td", {}, remove));
  }

  paintStatus() {
    const { status = [], messages = [] } = this.data;
    this.statusCells.forEach(([cell, message], r) => {
      const st = status[r] || "";
      cell.replaceChildren(st ? badge(st) : h("span", { class: "muted", title: "not checked" }, "—"));
      message.textContent = messages[r] || "";
      cell.parentElement.className = st ? `st-row-${st}` : "";
    });
  }

  paste(event) {
    const target = event.target;
    if (!(target instanceof HTMLInputElement) || target.dataset.row === undefined) return;
    const text = event.clipboardData ? event.clipboardData.getData("text/plain") : "";
    if (!/[\t\n\r]/.test(text)) return;
    event.preventDefault();
    let pasted = parseTabText(text).filter((cells) => cells.some((c) => c.trim() !== ""));
    const { columns, rows } = this.data;
    if (pasted.length && pasted[0].length === columns.length && pasted[0].every((c, i) => sameText(c, columns[i]))) pasted = pasted.slice(1);
    const r0 = Number(target.dataset.row);
    const c0 = Number(target.dataset.col);
    let dropped = 0;
    pasted.forEach((cells, i) => {
      const r = r0 + i;
      while (rows.length <= r) rows.push(columns.map(() => ""));
      cells.forEach((value, j) => {
        if (c0 + j < columns.length) rows[r][c0 + j] = value.trim();
        else if (value.trim() !== "") dropped += 1;
      });
    });
    this.data.status = [];
    this.data.messages = [];
    this.render();
    const what = `${pasted.length} row${pasted.length === 1 ? "" : "s"} pasted from row ${r0 + 1}`;
    this.note.textContent = dropped ? `${what}; ${dropped} cell(s) beyond the last column were left out.` : `${what}.`;
    this.send.now();
  }

  addRow() {
    this.data.rows.push(this.data.columns.map(() => ""));
    this.render();
    this.inputs[this.inputs.length - 1][0].focus();
  }

  removeRow(r) {
    this.data.rows.splice(r, 1);
    this.data.status.splice(r, 1);
    this.data.messages.splice(r, 1);
    this.render();
    this.send.now();
  }

  /** Send what is typed but not sent yet; resolves once the server has answered. */
  async flush() {
    this.send.cancel();
    while (this.unsent || this.inflight) await (this.inflight || this.post());
  }

  post() {
    if (this.sending) {
      this.again = true;
      return this.inflight;
    }
    this.inflight = this.postNow().finally(() => {
      this.inflight = null;
    });
    return this.inflight;
  }

  async postNow() {
    this.sending = true;
    this.unsent = false;
    try {
      const { columns, rows } = this.data;
      const state = await postJSON("api/schedule", { panel: this.panel, columns, rows });
      this.onEdited(this.panel);
      if (state.schedule && state.schedule.rows.length === this.data.rows.length) {
        this.data.status = state.schedule.status;
        this.data.messages = state.schedule.messages;
        this.paintStatus();
      }
      this.onState(state);
    } catch (err) {
      this.onError(err);
    } finally {
      this.sending = false;
      if (this.again) {
        this.again = false;
        this.unsent = true;
        this.send(); // what was typed meanwhile goes out next
      }
    }
  }

  /** Scroll to the row of a circuit (first column) and mark it. */
  showCircuit(circuit) {
    const r = this.data ? this.data.rows.findIndex((cells) => String(cells[0]).trim() === String(circuit).trim()) : -1;
    return this.showRow(r);
  }

  /** Scroll to row r (0 = the first row under the header) and mark it. */
  showRow(r) {
    if (!this.data || r < 0 || r >= this.inputs.length) return false;
    const tr = this.inputs[r][0].closest("tr");
    tr.scrollIntoView({ block: "center" });
    this.inputs[r][0].focus({ preventScroll: true });
    tr.classList.remove("flash");
    void tr.offsetWidth;
    tr.classList.add("flash");
    return true;
  }
}
