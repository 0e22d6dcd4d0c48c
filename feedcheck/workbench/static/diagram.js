// The one-line diagram of the feed, drawn from results.nodes (figures as the server
// formatted them). Source on the left, each run a line to the element it feeds.

import { s } from "./dom.js";

const BOX_W = 270;
const COL_GAP = 90;
const ROW_GAP = 18;
const HEAD_H = 40;
const LINE_H = 15;
const PAD = 14;

const STATUS_WORD = { fail: "FAIL", warn: "WARN", ok: "OK", info: "INFO" };

function layout(nodes) {
  const byId = new Map(nodes.map((n) => [n.id, { ...n, children: [] }]));
  const roots = [];
  for (const n of byId.values()) {
    const parent = n.parent && byId.get(n.parent);
    if (parent) parent.children.push(n);
    else roots.push(n);
  }
  for (const n of byId.values()) {
    n.shown = n.figures || [];
    n.h = HEAD_H + n.shown.length * LINE_H + 8;
  }
  const place = (n, depth, top) => {
    n.x = PAD + depth * (BOX_W + COL_GAP);
    if (!n.children.length) {
      n.y = top;
      return top + n.h;
    }
    let cursor = top;
    let bottom = top;
    n.children.forEach((child, i) => {
      bottom = place(child, depth + 1, cursor + (i ? ROW_GAP : 0));
      cursor = bottom;
    });
    const first = n.children[0];
    const last = n.children[n.children.length - 1];
    const centre = (first.y + first.h / 2 + last.y + last.h / 2) / 2;
    n.y = Math.max(top, centre - n.h / 2);
    return Math.max(bottom, n.y + n.h);
  };
  let cursor = PAD;
  for (const root of roots) cursor = place(root, 0, cursor) + ROW_GAP;
  return { all: [...byId.values()], height: cursor - ROW_GAP + PAD };
}

function nodeBox(n, onNode) {
  const status = n.status || "none";
  const g = s("g", {
    class: `node st-${status}`,
    transform: `translate(${n.x},${n.y})`,
    tabindex: "0",
    role: "button",
    "data-node": n.id,
    "aria-label": `${n.title || n.id}: ${STATUS_WORD[n.status] || "not checked"}; open its form`,
  });
  g.append(
    s("rect", { class: "node-box", width: BOX_W, height: n.h, rx: 6 }),
    s("rect", { class: "node-stripe", width: 6, height: n.h, rx: 2 }),
    s("text", { class: "node-id", x: 14, y: 18 }, n.id),
    s("text", { class: "node-status", x: BOX_W - 10, y: 18, "text-anchor": "end" }, STATUS_WORD[n.status] || ""),
    s("text", { class: "node-title", x: 14, y: 33 }, clip(n.title || n.kind || "", 40)),
  );
  n.shown.forEach(([label, value], i) => {
    const y = HEAD_H + 12 + i * LINE_H;
    g.append(
      s("text", { class: "fig-label", x: 14, y }, label, s("title", {}, label)),
      s("text", { class: "fig-value", x: BOX_W - 10, y, "text-anchor": "end" }, value),
    );
  });
  const open = () => onNode(n);
  g.addEventListener("click", open);
  g.addEventListener("keydown", (e) => {
    if (e.key === "Enter" || e.key === " ") {
      e.preventDefault();
      open();
    }
  });
  return g;
}

function clip(text, n) {
  return text.length > n ? `${text.slice(0, n - 1)}…` : text;
}

function link(parent, child, onRun) {
  const x1 = parent.x + BOX_W;
  const y1 = parent.y + parent.h / 2;
  const x2 = child.x;
  const y2 = child.y + child.h / 2;
  const mid = x1 + COL_GAP / 2 - 20;
  const g = s("g", { class: "link" });
  g.append(s("path", { class: "wire", d: `M${x1},${y1} H${mid} V${y2} H${x2}` }));
  if (child.via) {
    const label = s("text", { class: "via", x: mid + 6, y: y2 - 5, tabindex: "0", role: "button", "data-run": child.via }, child.via);
    label.addEventListener("click", () => onRun(child.via));
    label.addEventListener("keydown", (e) => {
      if (e.key === "Enter") onRun(child.via);
    });
    g.append(label);
  }
  return g;
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
  const { all, height } = layout(nodes);
  const byId = new Map(all.map((n) => [n.id, n]));
  const width = Math.max(...all.map((n) => n.x + BOX_W)) + PAD;
  const svg = s("svg", {
    class: "feed",
    width,
    height,
    viewBox: `0 0 ${width} ${height}`,
    role: "img",
    "aria-label": "One-line diagram of the feed",
  });
  for (const n of all) {
    const parent = n.parent && byId.get(n.parent);
    if (parent) svg.append(link(parent, n, onRun));
  }
  for (const n of all) svg.append(nodeBox(n, onNode));
  root.replaceChildren(svg);
  fitLabels(svg);
}

/** Shorten a figure's label (never its value) where the two would overlap. */
function fitLabels(svg) {
  for (const label of svg.querySelectorAll(".fig-label")) {
    const value = label.nextElementSibling;
    const room = BOX_W - 10 - value.getComputedTextLength() - 10 - 14;
    const full = label.firstChild.textContent;
    let n = full.length;
    while (n > 4 && label.getComputedTextLength() > room) {
      n -= 1;
      label.firstChild.textContent = `${full.slice(0, n).trimEnd()}…`;
    }
  }
}

/** The last drawn feed stays, marked as not current, while the input has errors. */
export function markStale(root, stale) {
  root.classList.toggle("stale", stale);
}
