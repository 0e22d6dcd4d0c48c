// The parts of the job (navigation list) and the form of the selected part.
// Keys, defaults, hints and choices come from the server's SCHEMA (the readers' own lists);
// messages under a field are the CLI's lines, as the server sends them.

import { badge, h, worse } from "./dom.js";

export function elementsOf(model, kind) {
  return (model.elements || []).filter((e) => e.kind === kind);
}

export function findElement(model, kind, index) {
  return (model.elements || []).find((e) => e.kind === kind && e.index === index) || null;
}

export function kindInfo(model, kind) {
  return ((model.schema && model.schema.kinds) || []).find((k) => k.kind === kind) || null;
}

function errorsFor(model, kind, index) {
  const errors = (model.results && model.results.input_errors) || [];
  return errors.filter((e) => e.kind === kind && e.index === index);
}

/** The worst status of an element: its input errors, findings and diagram node. */
function elementStatus(model, element) {
  const results = model.results || {};
  let status = "";
  if (errorsFor(model, element.kind, element.index).length) return "error";
  for (const f of results.findings || []) {
    if (f.kind === element.kind && f.index === element.index) status = worse(status, f.status);
  }
  for (const n of results.nodes || []) {
    if (element.id && n.id === element.id) status = worse(status, n.status);
  }
  return status;
}

function elementLabel(kind, element) {
  if (element.id) return element.id;
  if (kind.multiple) return `#${element.index + 1} (no id yet)`;
  return kind.title;
}

/** The list of the job's parts, grouped by kind in the schema's order. */
export function renderNav(nav, model, selected, { onSelect, onAdd, onText }) {
  const groups = [];
  for (const kind of (model.schema && model.schema.kinds) || []) {
    const items = elementsOf(model, kind.kind).map((element) => {
      const status = elementStatus(model, element);
      const current = selected.kind === kind.kind && selected.index === element.index;
      return h(
        "li",
        {},
        h(
          "button",
          {
            type: "button",
            class: `nav-item${current ? " current" : ""}`,
            "aria-current": current ? "true" : null,
            dataset: { kind: kind.kind, index: String(element.index) },
            onclick: () => onSelect(kind.kind, element.index),
          },
          h("span", { class: "nav-label" }, kind.multiple ? elementLabel(kind, element) : kind.title),
          ["error", "fail", "warn"].includes(status) ? badge(status) : null,
        ),
      );
    });
    const empty = !items.length;
    if (empty && !kind.multiple) {
      const current = selected.kind === kind.kind;
      items.push(
        h(
          "li",
          {},
          h(
            "button",
            {
              type: "button",
              class: `nav-item absent${current ? " current" : ""}`,
              dataset: { kind: kind.kind, index: "0" },
              onclick: () => onSelect(kind.kind, 0),
            },
            h("span", { class: "nav-label" }, kind.title),
            h("span", { class: "nav-none" }, "none"),
          ),
        ),
      );
    }
    const add =
      kind.multiple
        ? h(
            "button",
            {
              type: "button",
              class: "nav-add",
              dataset: { addKind: kind.kind },
              title: `Add to ${kind.title.toLowerCase()}`,
              onclick: () => onAdd(kind.kind),
            },
            "add",
          )
        : null;
    groups.push(
      h(
        "section",
        { class: "nav-group" },
        h("div", { class: "nav-group-head" }, h("span", {}, kind.multiple ? kind.title : ""), add),
        items.length ? h("ul", {}, items) : null,
      ),
    );
  }
  const text = selected.kind === "__text__";
  groups.push(
    h(
      "section",
      { class: "nav-group" },
      h(
        "button",
        { type: "button", class: `nav-item nav-text${text ? " current" : ""}`, onclick: onText },
        "Job file text",
      ),
    ),
  );
  nav.replaceChildren(...groups.filter((g) => g.querySelector("button")));
}

function titleOf(kind, element) {
  return kind.multiple ? `${kind.title} › ${element.id || `#${element.index + 1}`}` : kind.title;
}

function usefulHelp(field) {
  const help = (field.help || "").trim();
  return help !== "" && !["required", "optional"].includes(help.toLowerCase());
}

function fieldId(kind, index, key) {
  return `field-${kind}-${index}-${key}`.replace(/[^A-Za-z0-9_-]/g, "_");
}

function choiceInput(field, value, id) {
  const first = field.default ? `(default: ${field.default})` : "(not set)";
  const options = [h("option", { value: "" }, first)];
  const choices = [...(field.choices || [])];
  if (value && !choices.includes(value)) choices.unshift(value);
  for (const choice of choices) options.push(h("option", { value: choice }, choice));
  const select = h("select", { id, name: field.key }, options);
  select.value = value;
  return select;
}

function textInput(field, value, id, idList) {
  const input = h("input", {
    id,
    name: field.key,
    type: "text",
    autocomplete: "off",
    spellcheck: "false",
    placeholder: field.default ? `default: ${field.default}` : null,
    list: ["from", "to", "panel"].includes(field.key) ? idList : null,
  });
  input.value = value;
  return input;
}

/** The form of the selected part; kept in place while the user types. */
export class FormView {
  constructor(root, { onEdit, onCommit, onRemove, onAdd, extras }) {
    this.root = root;
    this.onEdit = onEdit;
    this.onCommit = onCommit;
    this.onRemove = onRemove;
    this.onAdd = onAdd;
    this.extras = extras;
    this.shown = null;
    this.fields = new Map();
    this.showAll = false;
  }

  /** Draw the form of (kind, index); redraws only when another part is shown. */
  show(model, selected, force = false) {
    const key = `${selected.kind}|${selected.index}`;
    const element = findElement(model, selected.kind, selected.index);
    // typing never redraws the form (focus and caret stay); only another part, or a
    // panel's schedule file changed once its field is left, draws it anew
    const schedule = (element && element.values && element.values.schedule) || "";
    const scheduleField = this.fields.get("schedule");
    const scheduleSame = this.shownSchedule === schedule || (scheduleField && document.activeElement === scheduleField.input);
    const sameShape = this.shown === key && scheduleSame;
    if (!force && sameShape && this.fields.size) return this.update(model);
    this.shown = key;
    this.shownSchedule = schedule;
    this.fields = new Map();
    this.foldable = null;
    const kind = kindInfo(model, selected.kind);
    if (!kind) return this.root.replaceChildren(h("p", { class: "muted" }, "Nothing selected."));
    if (!element) return this.root.replaceChildren(this.absent(kind));
    this.root.replaceChildren(this.form(model, kind, element));
    this.update(model);
    if (this.extras) this.extras(this.root, model, kind, element);
  }

  absent(kind) {
    return h(
      "div",
      { class: "form-empty" },
      h("h2", {}, kind.title),
      h("p", {}, `This job has no ${kind.title.toLowerCase()} table; the defaults apply.`),
      h("button", { type: "button", onclick: () => this.onAdd(kind.kind) }, `Add ${kind.title.toLowerCase()}`),
    );
  }

  form(model, kind, element) {
    const idList = "known-ids";
    const ids = (model.elements || []).filter((e) => e.id).map((e) => e.id);
    const datalist = h("datalist", { id: idList }, ["source", ...ids].map((v) => h("option", { value: v })));
    const title = titleOf(kind, element);
    const head = h(
      "div",
      { class: "form-head" },
      h("h2", { id: "form-title" }, title),
      kind.multiple
        ? h(
            "button",
            {
              type: "button",
              class: "quiet danger",
              onclick: () => this.onRemove(kind, element),
            },
            "Remove",
          )
        : null,
    );
    const general = h("div", { class: "form-errors", id: "form-errors" });
    const rows = kind.fields.map((field) => this.fieldRow(kind, element, field, idList));
    this.toggle = h("button", { type: "button", class: "quiet more", id: "more-fields", onclick: () => this.toggleAll() });
    return h(
      "form",
      { class: "element-form", autocomplete: "off", onsubmit: (e) => e.preventDefault() },
      head,
      general,
      h("div", { class: "fields" }, rows),
      this.toggle,
      datalist,
    );
  }

  toggleAll() {
    this.showAll = !this.showAll;
    this.foldEmpty();
  }

  /** Optional settings left empty fold away (the defaults apply); shown on demand. */
  foldEmpty() {
    const isEmpty = ({ input, row, field }) => !field.required && input.value === "" && !row.classList.contains("has-error");
    if (!this.foldable) {
      // decided once per form drawn, so a field does not vanish while the form is in use;
      // a table with nothing filled in yet (just added, or all defaults) folds nothing
      const empty = [...this.fields].filter(([, f]) => isEmpty(f)).map(([key]) => key);
      this.foldable = new Set(empty.length === this.fields.size ? [] : empty);
    }
    let folded = 0;
    for (const [key, f] of this.fields) {
      const fold = this.foldable.has(key) && isEmpty(f);
      if (fold) folded += 1;
      f.row.hidden = fold && !this.showAll && document.activeElement !== f.input;
    }
    if (!this.toggle) return;
    this.toggle.hidden = folded === 0;
    this.toggle.textContent = this.showAll ? "Hide the settings left empty" : `Show ${folded} more setting${folded === 1 ? "" : "s"} (empty: defaults apply)`;
  }

  fieldRow(kind, element, field, idList) {
    const id = fieldId(kind.kind, element.index, field.key);
    const value = (element.values && element.values[field.key]) ?? "";
    const input = field.choices && field.choices.length ? choiceInput(field, value, id) : textInput(field, value, id, idList);
    input.dataset.key = field.key;
    const errorId = `${id}-error`;
    input.setAttribute("aria-describedby", errorId);
    const send = () => this.onEdit(kind.kind, element.index, field.key, input.value);
    input.addEventListener("input", send);
    input.addEventListener("change", () => {
      send();
      this.onCommit();
    });
    const error = h("p", { class: "field-error", id: errorId, hidden: true });
    const row = h(
      "div",
      { class: "field", dataset: { key: field.key } },
      h(
        "div",
        { class: "field-label" },
        h("label", { for: id }, field.label || field.key),
        field.required ? h("span", { class: "req" }, "required") : null,
        h("span", { class: "keyname", title: "the key in the job file" }, field.key),
      ),
      h("div", { class: "field-input" }, input, field.hint ? h("span", { class: "hint" }, field.hint) : null),
      h("div", { class: "field-notes" }, error, usefulHelp(field) ? h("p", { class: "help" }, field.help) : null),
    );
    this.fields.set(field.key, { input, error, row, field });
    return row;
  }

  /** New state: fresh values where the user is not typing, messages under the fields. */
  update(model) {
    const [kindName, indexText] = (this.shown || "").split("|");
    const index = Number(indexText);
    const element = findElement(model, kindName, index);
    if (!element) return;
    const pending = model.pendingKeys || new Set();
    const kind = kindInfo(model, kindName);
    const title = this.root.querySelector("#form-title");
    if (kind && title) title.textContent = titleOf(kind, element);
    for (const [key, { input, error, row }] of this.fields) {
      const typing = document.activeElement === input || pending.has(`${kindName}|${index}|${key}`);
      const value = (element.values && element.values[key]) ?? "";
      if (!typing && input.value !== value) input.value = value;
      error.hidden = true;
      error.textContent = "";
      row.classList.remove("has-error");
    }
    const general = this.root.querySelector("#form-errors");
    const loose = [];
    for (const problem of errorsFor(model, kindName, index)) {
      const field = problem.key && this.fields.get(problem.key);
      if (field) {
        field.error.hidden = false;
        field.error.textContent = field.error.textContent ? `${field.error.textContent}\n${problem.message}` : problem.message;
        field.row.classList.add("has-error");
        field.input.setAttribute("aria-invalid", "true");
      } else {
        loose.push(h("p", { class: "field-error" }, problem.message));
      }
    }
    for (const { input, row } of this.fields.values()) {
      if (!row.classList.contains("has-error")) input.removeAttribute("aria-invalid");
    }
    if (general) general.replaceChildren(...loose);
    this.foldEmpty();
  }

  /** Take the user to a field: scroll it into view, focus it, mark it for a moment. */
  focusField(key) {
    const field = key && this.fields.get(key);
    if (field && field.row.hidden) {
      this.showAll = true;
      this.foldEmpty();
    }
    const target = field ? field.row : this.root.querySelector(".form-head");
    if (!target) return false;
    (field ? field.input : target).scrollIntoView({ block: "center" });
    if (field) field.input.focus({ preventScroll: true });
    target.classList.remove("flash");
    void target.offsetWidth;
    target.classList.add("flash");
    return Boolean(field);
  }
}
