// Small DOM helpers: elements are built with textContent only (never from HTML strings).

const SVG_NS = "http://www.w3.org/2000/svg";

function fill(el, attrs, children) {
  for (const [key, value] of Object.entries(attrs || {})) {
    if (value === null || value === undefined || value === false) continue;
    if (key === "class") el.setAttribute("class", value);
    else if (key === "text") el.textContent = value;
    else if (key === "dataset") Object.assign(el.dataset, value);
    else if (key.startsWith("on")) el.addEventListener(key.slice(2), value);
    else el.setAttribute(key, value === true ? "" : String(value));
  }
  for (const child of children.flat()) {
    if (child === null || child === undefined || child === false) continue;
    el.append(child instanceof Node ? child : String(child));
  }
  return el;
}

/** An HTML element: h("p", {class: "x", onclick: f}, "text", child). */
export function h(tag, attrs, ...children) {
  return fill(document.createElement(tag), attrs, children);
}

/** An SVG element, same calling convention as h(). */
export function s(tag, attrs, ...children) {
  return fill(document.createElementNS(SVG_NS, tag), attrs, children);
}

/** The status words, in the order a list shows them (failures first). */
export const STATUS_ORDER = ["error", "fail", "warn", "info", "ok", ""];

export function statusRank(status) {
  const i = STATUS_ORDER.indexOf(status || "");
  return i < 0 ? STATUS_ORDER.length : i;
}

/** The worse of two statuses. */
export function worse(a, b) {
  return statusRank(a) <= statusRank(b) ? a : b;
}

/** A status shown by word and colour, never colour alone. */
export function badge(status) {
  const word = status === "error" ? "input error" : status || "not checked";
  return h("span", { class: `badge st-${status || "none"}` }, word);
}

/** Call fn at most once per quiet period of `ms` after the last call. */
export function debounce(fn, ms) {
  let timer = null;
  const wrapped = (...args) => {
    clearTimeout(timer);
    timer = setTimeout(() => {
      timer = null;
      fn(...args);
    }, ms);
  };
  wrapped.now = (...args) => {
    clearTimeout(timer);
    timer = null;
    fn(...args);
  };
  wrapped.cancel = () => {
    clearTimeout(timer);
    timer = null;
  };
  return wrapped;
}
