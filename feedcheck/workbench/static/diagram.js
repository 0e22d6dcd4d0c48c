// The one-line diagram of the feed, drawn from results.nodes (figures as the server
// formatted them). Source on the left, each run a line to the element it feeds; every
// column as wide as its widest node needs (up to MAX_W, then labels are shortened).

import { s } from "./dom.js";

const MIN_W = 190;
const MAX_W = 290;
const COL_GAP = 64;
const ROW_GAP = 18;
const HEAD_H = 40;
const LINE_H = 15;
const PAD = 14;
const ATTACH_Y = 26; // wires meet the boxes level with their titles

const STATUS_WORD = { fail: "FAIL", warn: "WARN", ok: "OK", info: "INFO" };

function tree(nodes) {
  const byId = new Map(nodes.map((n) => [n.id, { ...n, children: [], figures: n.figures || [] }]));
  const roots = [];
  for (const n of byId.values()) {
    const parent = n.parent && byId.get(n.parent);
    if (parent) parent.children.push(n);
    else roots.push(n);
    n.h = HEAD_H + n.figures.length * LINE_H + 8;
  }
  const depth = (n, d) => {
    n.depth = d;
    for (const c of n.children) depth(c, d + 1);
  };
  for (const r of roots) depth(r, 0);
  return { byId, roots };
}

/** The width each node needs for its title and its longest label + value. */
function measure(svg, all) {
  const probe = s("text", { x: 0, y: -100 });
  svg.append(probe);
  const width = (cls, text) => {
    probe.setAttribute("class", cls);
    probe.textContent = text;
    return probe.getComputedTextLength();
  };
  for (const n of all) {
    const needs = [width("node-title", n.title || "") + 28, width("node-id", n.id) + 80];
    for (const [label, value] of n.figures) needs.push(width("fig-label", label) + width("fig-value", value) + 40);
    n.need = Math.min(MAX_W, Math.max(MIN_W, ...needs));
  }
  probe.remove();
}

function place(roots, all) {
  const columns = [];
  for (const n of all) columns[n.depth] = Math.max(columns[n.depth] || 0, n.need);
  const left = [PAD];
  columns.forEach((w, d) => (left[d + 1] = left[d] + w + COL_GAP));
  const put = (n, top) => {
    n.x = left[n.depth];
    n.w = columns[n.depth];
    if (!n.children.length) {
      n.y = top;
      return top + n.h;
    }
    let cursor = top;
    n.children.forEach((child, i) => {
      cursor = put(child, cursor + (i ? ROW_GAP : 0));
    });
    // level with its first child: the main line of the feed runs straight across the top,
    // branches below it (a tall feed keeps its source in the first screenful)
    n.y = top;
    return Math.max(cursor, n.y + n.h);
  };
  let cursor = PAD;
  for (const root of roots) cursor = put(root, cursor) + ROW_GAP;
  return { width: left[columns.length] - COL_GAP + PAD, height: cursor - ROW_GAP + PAD };
}

function clip(text, n) {
  return text.length > n ? `${text.slice(0, n - 1)}…` : text;
}

function onActivate(el, fn) {
  el.addEventListener("click", fn);
  el.addEventListener("keydown", (e) => {
    if (e.key === "Enter" || e.key === " ") {
      e.preventDefault();
      fn();
    }
  });
}

function nodeBox(n, onNode) {
  const status = n.status || "none";
  const g = s("g", {
    class: `node st-${status}`,
    transform: `translate(${n.x},${n.y})`,
    tabindex: "0",
    role: "button",
    "data-node": n.id,
    "aria-label": `${n.title || n.id}: ${STATUS_WORD[n.status] || "nothing held against a limit"}; open its form`,
  });
  g.append(
    s("rect", { class: "node-box", width: n.w, height: n.h, rx: 6 }),
    s("rect", { class: "node-stripe", width: 6, height: n.h, rx: 2 }),
    s("text", { class: "node-id", x: 14, y: 18 }, n.id),
    s("text", { class: "node-status", x: n.w - 10, y: 18, "text-anchor": "end" }, STATUS_WORD[n.status] || ""),
    s("text", { class: "node-title", x: 14, y: 33 }, clip(n.title || n.kind || "", 52)),
  );
  n.figures.forEach(([label, value], i) => {
    const y = HEAD_H + 12 + i * LINE_H;
    g.append(
      s("text", { class: "fig-label", x: 14, y }, label, s("title", {}, `${label}: ${value}`)),
      s("text", { class: "fig-value", x: n.w - 10, y, "text-anchor": "end" }, value),
    );
  });
  onActivate(g, () => onNode(n));
  return g;
}

function link(parent, child, onRun) {
  const x1 = parent.x + parent.w;
  const y1 = parent.y + ATTACH_Y;
  const x2 = child.x;
  const y2 = child.y + ATTACH_Y;
  const mid = x1 + 18;
  const g = s("g", { class: "link" });
  g.append(s("path", { class: "wire", d: `M${x1},${y1} H${mid} V${y2} H${x2}` }));
  if (child.via) {
    const label = s(
      "text",
      { class: "via", x: mid + 6, y: y2 - 5, tabindex: "0", role: "button", "data-run": child.via, "aria-label": `run ${child.via}: open its form` },
      child.via,
    );
    onActivate(label, () => onRun(child.via));
    g.append(label);
  }
  return g;
}

/** Shorten a figure's label (never its value) where the two would still overlap. */
function fitLabels(svg) {
  for (const label of svg.querySelectorAll(".fig-label")) {
    const value = label.nextElementSibling;
    const box = label.parentElement.querySelector(".node-box");
    const room = Number(box.getAttribute("width")) - 10 - value.getComputedTextLength() - 10 - 14;
    const text = label.firstChild;
    const full = text.textContent;
    let n = full.length;
    while (n > 4 && label.getComputedTextLength() > room) {
      n -= 1;
      text.textContent = `${full.slice(0, n).trimEnd()}…`;
    }
  }
}

/** The last drawn feed stays, marked as not current, while the input has errors. */
function markStale(root, stale) {
  root.classList.toggle("stale", stale);
}

/** Draw the feed; onNode(node) and onRun(runId) open the forms. */
export function renderDiagram(root, results, { onNode, onRun }) {
  const nodes = (results && results.nodes) || [];
  if (!nodes.length && results && results.valid === false && root.querySelector("svg.feed")) {
    markStale(root, true);
    return;
  }
  markStale(root, false);
  if (!nodes.length) {
    const why = results && results.valid === false ? "The feed is drawn once the input errors are fixed." : "No feed to draw yet.";
    const p = document.createElement("p");
    p.className = "diagram-empty";
    p.textContent = why;
    root.replaceChildren(p);
    return;
  }
  const { byId, roots } = tree(nodes);
  const all = [...byId.values()];
  const svg = s("svg", { class: "feed", role: "group", "aria-label": "One-line diagram of the feed" });
  root.replaceChildren(svg);
  measure(svg, all);
  const { width, height } = place(roots, all);
  svg.setAttribute("width", width);
  svg.setAttribute("height", height);
  svg.setAttribute("viewBox", `0 0 ${width} ${height}`);
  for (const n of all) {
    const parent = n.parent && byId.get(n.parent);
    if (parent) svg.append(link(parent, n, onRun));
  }
  for (const n of all) svg.append(nodeBox(n, onNode));
  fitLabels(svg);
}

/** Mark the selected element in the diagram (a node, or a run's label and the node it
 * feeds) and scroll it into view when it is out of sight. */
export function showSelected(root, nodeId, runId) {
  for (const el of root.querySelectorAll(".selected")) el.classList.remove("selected");
  const svg = root.querySelector("svg.feed");
  if (!svg) return;
  const esc = (v) => (window.CSS && CSS.escape ? CSS.escape(v) : v);
  const run = runId ? svg.querySelector(`.via[data-run="${esc(runId)}"]`) : null;
  if (run) run.classList.add("selected");
  const target = nodeId ? svg.querySelector(`.node[data-node="${esc(nodeId)}"]`) : null;
  if (target) target.classList.add("selected");
  const focus = target || run;
  if (!focus) return;
  const box = focus.getBoundingClientRect();
  const view = root.getBoundingClientRect();
  const inside = box.left >= view.left && box.right <= view.right && box.top >= view.top && box.bottom <= view.bottom;
  if (!inside) {
    root.scrollLeft += box.left - view.left - 40;
    root.scrollTop += box.top - view.top - 20;
  }
}
