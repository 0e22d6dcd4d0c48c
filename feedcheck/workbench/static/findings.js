// The findings list: input errors first, then failures, warnings, information, passing.
// Each row takes the user to the part and field it concerns.

import { badge, h, statusRank } from "./dom.js";

function where(item) {
  if (!item.kind) return item.line ? { kind: null, line: item.line } : null;
  return { kind: item.kind, index: item.index ?? 0, key: item.key || null, subject: item.subject || null, row: item.row ?? null };
}

/** The CLI's line without what the row shows beside it (status word, subject, rule). */
function shortLine(item) {
  let text = item.message || "";
  const head = `${item.status || ""} ${item.subject || ""} `.toLowerCase();
  const squeezed = text.replace(/^(\S+)\s+(\S+)\s+/, "$1 $2 ").toLowerCase();
  if (item.subject && squeezed.startsWith(head)) text = text.replace(/^\S+\s+\S+\s+/, "");
  const tail = ` [${item.rule_id}]`;
  if (item.rule_id && text.trimEnd().endsWith(tail)) text = text.trimEnd().slice(0, -tail.length).trimEnd();
  return text;
}

function row(item, status, text, subject, onGo) {
  const target = where(item);
  const body = [badge(status), subject ? h("span", { class: "subject" }, subject) : null, h("span", { class: "message" }, text)];
  if (item.note) body.push(h("span", { class: "note" }, item.note));
  if (item.rule_id) body.push(h("span", { class: "rule" }, item.rule_id));
  if (!target) return h("li", { class: `finding st-${status}` }, h("div", { class: "finding-body" }, body));
  return h(
    "li",
    { class: `finding st-${status}` },
    h(
      "button",
      {
        type: "button",
        class: "finding-body",
        title: target.kind ? `Go to ${target.kind} ${subject || ""}${target.key ? ` · ${target.key}` : ""}` : `Go to line ${target.line} of the job file`,
        dataset: { kind: target.kind || "", index: String(target.index ?? ""), key: target.key || "" },
        onclick: () => onGo(target),
      },
      body,
    ),
  );
}

/** Draw the findings of the current results; `state.showOk` reveals the passing checks. */
export function renderFindings(root, results, view, { onGo, onToggleOk }) {
  const parts = [];
  const errors = (results && results.input_errors) || [];
  const findings = [...((results && results.findings) || [])].sort((a, b) => statusRank(a.status) - statusRank(b.status));
  const counts = (results && results.counts) || {};
  if (errors.length) {
    parts.push(
      h("h2", { class: "list-head" }, `Input errors (${errors.length})`),
      h("p", { class: "muted" }, "The job is checked once these are fixed; nothing is lost meanwhile."),
      h("ul", { class: "finding-list", id: "input-errors" }, errors.map((e) => row(e, "error", e.message, e.subject || idOf(e), onGo))),
    );
  }
  if (results && results.valid !== false) {
    const shown = findings.filter((f) => view.showOk || f.status !== "ok");
    const okCount = counts.ok ?? findings.filter((f) => f.status === "ok").length;
    parts.push(
      h(
        "div",
        { class: "list-head-row" },
        h("h2", { class: "list-head" }, "Findings"),
        okCount
          ? h(
              "button",
              { type: "button", class: "quiet", id: "toggle-ok", "aria-pressed": view.showOk ? "true" : "false", onclick: onToggleOk },
              view.showOk ? "Hide passing checks" : `Show ${okCount} passing`,
            )
          : null,
      ),
    );
    if (!shown.length) parts.push(h("p", { class: "muted" }, "No failures, warnings or notes."));
    else parts.push(h("ul", { class: "finding-list", id: "finding-list" }, shown.map((f) => row(f, f.status, shortLine(f), f.subject, onGo))));
  }
  root.replaceChildren(...parts);
}

function idOf(error) {
  if (!error.kind) return null;
  return error.key ? `${error.kind} ${error.index + 1} · ${error.key}` : `${error.kind} ${error.index + 1}`;
}
