// Small DOM helpers. Every piece of user text goes in through textContent
// (or an attribute value), never through innerHTML.

export const $ = (id) => document.getElementById(id);

// el builds an element: el('td', {class: 'num', 'data-x': 1}, 'text' | Node | [children]).
export function el(tag, attrs, children) {
  const node = document.createElement(tag);
  setAttrs(node, attrs);
  append(node, children);
  return node;
}

const SVGNS = 'http://www.w3.org/2000/svg';

// svg builds an SVG element the same way.
export function svg(tag, attrs, children) {
  const node = document.createElementNS(SVGNS, tag);
  setAttrs(node, attrs);
  append(node, children);
  return node;
}

function setAttrs(node, attrs) {
  if (!attrs) return;
  for (const [k, v] of Object.entries(attrs)) {
    if (v === undefined || v === null || v === false) continue;
    if (k === 'text') node.textContent = String(v);
    else if (k === 'hidden') node.hidden = true;
    else node.setAttribute(k, v === true ? '' : String(v));
  }
}

function append(node, children) {
  if (children === undefined || children === null) return;
  if (!Array.isArray(children)) children = [children];
  for (const c of children) {
    if (c === undefined || c === null || c === false) continue;
    node.append(c instanceof Node ? c : document.createTextNode(String(c)));
  }
}

// clear removes all children of a node.
export function clear(node) {
  while (node.firstChild) node.removeChild(node.firstChild);
  return node;
}

// fmt formats a number for people: fixed digits, '—' for missing values.
export function fmt(v, digits = 3) {
  if (v === undefined || v === null || typeof v !== 'number' || Number.isNaN(v)) return '—';
  if (!Number.isFinite(v)) return v > 0 ? '∞' : '−∞';
  return v.toLocaleString('en-GB', { minimumFractionDigits: digits, maximumFractionDigits: digits });
}

// fmtAuto formats a measured value with sensible digits for its size.
export function fmtAuto(v) {
  if (v === undefined || v === null || typeof v !== 'number' || Number.isNaN(v)) return '—';
  const a = Math.abs(v);
  const digits = a >= 1000 ? 0 : a >= 10 ? 1 : a >= 1 ? 2 : 4;
  return v.toLocaleString('en-GB', { maximumFractionDigits: digits });
}

// pct formats a percentage change with its sign.
export function pct(v) {
  if (v === undefined || v === null || typeof v !== 'number' || !Number.isFinite(v)) return '—';
  const s = Math.abs(v) < 0.05 ? '0.0' : v.toFixed(1);
  return (v > 0.05 ? '+' : '') + s + '%';
}

// download offers a Blob to the user as a file via an <a download> link.
export function download(blob, filename) {
  const url = URL.createObjectURL(blob);
  const a = el('a', { href: url, download: filename, class: 'download-link' });
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 60_000);
}

// debounce delays fn until calls stop for ms milliseconds.
export function debounce(fn, ms) {
  let t = 0;
  return (...args) => {
    clearTimeout(t);
    t = setTimeout(() => fn(...args), ms);
  };
}

// hoverTips shows a visible label for any element inside container that
// carries the attribute attr, when it is hovered or focused.
export function hoverTips(container, attr) {
  const tip = $('tip');
  const sel = '[' + attr + ']';
  const show = (target, x, y) => {
    tip.textContent = target.getAttribute(attr);
    tip.hidden = false;
    const r = tip.getBoundingClientRect();
    const left = Math.min(window.innerWidth - r.width - 8, Math.max(8, x + 12));
    const top = y - r.height - 12 < 8 ? y + 16 : y - r.height - 12;
    tip.style.left = left + window.scrollX + 'px';
    tip.style.top = top + window.scrollY + 'px';
  };
  const hide = () => { tip.hidden = true; };
  container.addEventListener('pointerover', (e) => {
    const t = e.target.closest(sel);
    if (t) show(t, e.clientX, e.clientY);
  });
  container.addEventListener('pointermove', (e) => {
    const t = e.target.closest(sel);
    if (t) show(t, e.clientX, e.clientY); else hide();
  });
  container.addEventListener('pointerleave', hide);
  container.addEventListener('focusin', (e) => {
    const t = e.target.closest(sel);
    if (!t) return;
    const r = t.getBoundingClientRect();
    show(t, r.left + r.width / 2, r.top);
  });
  container.addEventListener('focusout', hide);
}
