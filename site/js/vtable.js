// A windowed table: only the rows in view (plus a margin) are in the DOM, so
// tables of 10,000 rows scroll smoothly. Rows are built by the caller and kept
// while they stay in the window, so a focused control inside a row survives
// scrolling.

import { el, clear } from './dom.js';

const OVERSCAN = 8;

export class VirtualTable {
  // container: an element styled to scroll (overflow: auto, fixed height).
  // opts.caption: text for a caption (read by screen readers).
  // opts.buildHead(theadRow): fills the header row.
  // opts.buildRow(index): returns a <tr> for logical row index.
  // opts.className: class for the <table>.
  constructor(container, opts) {
    this.container = container;
    this.opts = opts;
    this.count = 0;
    this.rows = new Map();
    this.rowHeight = 0;
    clear(container);
    this.table = el('table', { class: opts.className || '' });
    if (opts.caption) this.table.append(el('caption', { class: 'visually-hidden' }, opts.caption));
    this.thead = el('thead');
    this.headRow = el('tr');
    this.thead.append(this.headRow);
    this.tbody = el('tbody');
    this.topPad = el('tr', { class: 'vpad', 'aria-hidden': 'true' });
    this.bottomPad = el('tr', { class: 'vpad', 'aria-hidden': 'true' });
    this.table.append(this.thead, this.tbody);
    container.append(this.table);
    this.pending = false;
    container.addEventListener('scroll', () => this.schedule(), { passive: true });
    this.resizeObserver = new ResizeObserver(() => this.schedule());
    this.resizeObserver.observe(container);
    this.rebuildHead();
  }

  rebuildHead() {
    clear(this.headRow);
    this.opts.buildHead(this.headRow);
    this.columns = this.headRow.children.length;
    this.topPad.replaceChildren(el('td', { colspan: this.columns }));
    this.bottomPad.replaceChildren(el('td', { colspan: this.columns }));
  }

  // keepFocus runs fn (which may rebuild rows or the header) and puts
  // keyboard focus back on the same control or cell afterwards.
  keepFocus(fn) {
    const a = document.activeElement;
    if (!a || a === document.body || !this.table.contains(a)) return fn();
    const tr = a.closest('tr');
    const key = {
      id: a.id,
      row: tr && tr.dataset.vrow !== undefined ? Number(tr.dataset.vrow) : -1,
      col: a.getAttribute('data-col'),
      tag: a.tagName.toLowerCase(),
      head: this.thead.contains(a),
    };
    const out = fn();
    let target = key.id ? document.getElementById(key.id) : null;
    if (!target && key.row >= 0) {
      const row = this.rows.get(key.row);
      if (row) target = key.col !== null ? row.querySelector(key.tag + '[data-col="' + key.col + '"]') : row.querySelector(key.tag);
    }
    if (!target && key.head && key.col !== null) target = this.headRow.querySelector('[data-col="' + key.col + '"]');
    if (target && this.table.contains(target)) target.focus({ preventScroll: true });
    return out;
  }

  // setCount sets the number of logical rows and drops all built rows.
  setCount(n) {
    this.count = n;
    this.invalidate();
  }

  // invalidate drops built rows (their content changed) and re-renders.
  invalidate() {
    for (const tr of this.rows.values()) tr.remove();
    this.rows.clear();
    this.render();
  }

  // updateRow rebuilds one row if it is on screen.
  updateRow(i) {
    const old = this.rows.get(i);
    if (!old) return;
    this.keepFocus(() => {
      const tr = this.opts.buildRow(i);
      tr.dataset.vrow = i;
      this.rows.set(i, tr);
      old.replaceWith(tr);
    });
  }

  schedule() {
    if (this.pending) return;
    this.pending = true;
    requestAnimationFrame(() => {
      this.pending = false;
      this.render();
    });
  }

  measure() {
    if (this.rowHeight > 0 || this.count === 0) return;
    const tr = this.opts.buildRow(0);
    this.tbody.append(tr);
    const h = tr.getBoundingClientRect().height;
    tr.remove();
    if (h > 0) this.rowHeight = h;
  }

  // renderAll puts every row in the DOM (for printing).
  renderAll() {
    this.render(0, this.count);
  }

  render(forceStart, forceEnd) {
    this.measure();
    const rh = this.rowHeight || 32;
    const headH = this.thead.getBoundingClientRect().height;
    const view = this.container.clientHeight || 600;
    const top = Math.max(0, this.container.scrollTop - headH);
    let start = forceStart ?? Math.max(0, Math.floor(top / rh) - OVERSCAN);
    let end = forceEnd ?? Math.min(this.count, Math.ceil((top + view) / rh) + OVERSCAN);
    if (end < start) end = start;
    for (const [i, tr] of this.rows) {
      if (i < start || i >= end) {
        this.rows.delete(i);
        tr.remove();
      }
    }
    const wanted = [];
    for (let i = start; i < end; i++) {
      let tr = this.rows.get(i);
      if (!tr) {
        tr = this.opts.buildRow(i);
        tr.dataset.vrow = i;
        this.rows.set(i, tr);
      }
      wanted.push(tr);
    }
    // Put rows in order without detaching ones that are already in place
    // (detaching would drop keyboard focus).
    let prev = this.topPad;
    if (this.tbody.firstChild !== this.topPad) this.tbody.prepend(this.topPad);
    for (const tr of wanted) {
      if (prev.nextSibling !== tr) prev.after(tr);
      prev = tr;
    }
    if (prev.nextSibling !== this.bottomPad) prev.after(this.bottomPad);
    while (this.bottomPad.nextSibling) this.bottomPad.nextSibling.remove();
    this.topPad.firstChild.style.height = start * rh + 'px';
    this.bottomPad.firstChild.style.height = (this.count - end) * rh + 'px';
    this.topPad.hidden = start === 0;
    this.bottomPad.hidden = end === this.count;
    this.start = start;
    this.end = end;
  }

  // rowElement returns the built row for index i, scrolling it into view and
  // rendering first when needed.
  rowElement(i) {
    if (i < 0 || i >= this.count) return null;
    if (!this.rows.has(i)) {
      this.scrollToRow(i);
    }
    return this.rows.get(i) || null;
  }

  // scrollToRow brings row i into the middle of the view and renders now.
  scrollToRow(i) {
    this.measure();
    const rh = this.rowHeight || 32;
    const headH = this.thead.getBoundingClientRect().height;
    const view = this.container.clientHeight || 600;
    const y = headH + i * rh;
    if (y < this.container.scrollTop + headH || y + rh > this.container.scrollTop + view) {
      this.container.scrollTop = Math.max(0, y - view / 2);
    }
    this.render();
  }
}
