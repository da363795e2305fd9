// The results table for every unit: sortable by any column (header
// buttons), filtered by status, searched by name, windowed so 10,000 rows
// scroll smoothly. Each row carries the engine's exact score in data-score.

import { $, el, fmt } from './dom.js';
import { VirtualTable } from './vtable.js';

const STATUS_WORDS = {
  efficient: 'efficient',
  'weakly efficient': 'weakly efficient',
  inefficient: 'inefficient',
  'not solved': 'not solved',
};

const SCALE_WORDS = { constant: 'right size', increasing: 'could grow', decreasing: 'could shrink' };

// superValue gives a unit's super-efficiency, or null.
function superValue(u) {
  return typeof u.super === 'number' ? u.super : null;
}

const COLUMNS = [
  { key: 'name', label: 'Unit', get: (u) => u.name, text: true },
  { key: 'score', label: 'Score', get: (u) => u.score, num: true },
  { key: 'status', label: 'Status', get: (u) => u.status, text: true },
  { key: 'scaleClass', label: 'Returns to scale', get: (u) => u.scaleClass || '', text: true },
  { key: 'scaleEfficiency', label: 'Scale efficiency', get: (u) => u.scaleEfficiency, num: true },
  { key: 'super', label: 'Super-efficiency', get: superValue, num: true },
  { key: 'peers', label: 'Peers', get: (u) => (u.peers || []).map((p) => p.name).join(', '), text: true },
  { key: 'verified', label: 'Verified', get: (u) => (u.certificate && u.certificate.verified ? 1 : 0), num: true },
];

export class ResultsTable {
  constructor(onSelect) {
    this.onSelect = onSelect;
    this.result = null;
    this.order = [];
    this.sortKey = null;
    this.sortDir = 1;
    this.selected = -1;
    this.vt = new VirtualTable($('results-table'), {
      className: 'grid results-grid',
      caption: 'Results for every unit',
      buildHead: (tr) => this.buildHead(tr),
      buildRow: (i) => this.buildRow(i),
    });
    $('filter-status').addEventListener('change', () => this.apply());
    $('search').addEventListener('input', () => this.apply());
    this.vt.container.addEventListener('keydown', (e) => this.onKey(e));
    window.addEventListener('beforeprint', () => this.vt.renderAll());
    window.addEventListener('afterprint', () => this.vt.render());
  }

  show(result) {
    this.result = result;
    this.selected = -1;
    this.sortKey = null;
    this.sortDir = 1;
    this.vt.rebuildHead();
    this.apply();
  }

  apply() {
    if (!this.result) return;
    const units = this.result.units;
    const status = $('filter-status').value;
    const q = $('search').value.trim().toLocaleLowerCase();
    let idx = [];
    for (let k = 0; k < units.length; k++) {
      const u = units[k];
      if (status && u.status !== status) continue;
      if (q && !String(u.name).toLocaleLowerCase().includes(q)) continue;
      idx.push(k);
    }
    if (this.sortKey) {
      const col = COLUMNS.find((c) => c.key === this.sortKey);
      const dir = this.sortDir;
      const keyed = idx.map((k) => [k, col.get(units[k])]);
      keyed.sort((a, b) => {
        const x = a[1], y = b[1];
        const xm = x === null || x === undefined || x === '' || Number.isNaN(x);
        const ym = y === null || y === undefined || y === '' || Number.isNaN(y);
        if (xm || ym) return xm === ym ? a[0] - b[0] : xm ? 1 : -1; // missing values last
        if (col.num) return (x - y) * dir || a[0] - b[0];
        return String(x).localeCompare(String(y), undefined, { numeric: true }) * dir || a[0] - b[0];
      });
      idx = keyed.map((p) => p[0]);
    }
    this.order = idx;
    $('results-count').textContent = idx.length === units.length ? units.length + ' units' : idx.length + ' of ' + units.length + ' units';
    this.vt.setCount(idx.length);
  }

  buildHead(tr) {
    for (const col of COLUMNS) {
      const active = this.sortKey === col.key;
      const th = el('th', { scope: 'col', class: 'col-' + col.key + (col.num ? ' num' : ''), 'aria-sort': active ? (this.sortDir > 0 ? 'ascending' : 'descending') : 'none' });
      const arrow = active ? (this.sortDir > 0 ? ' ▲' : ' ▼') : '';
      const b = el('button', { type: 'button', class: 'sort', 'data-sort': col.key }, [col.label, el('span', { 'aria-hidden': 'true', class: 'sort-arrow' }, arrow)]);
      b.addEventListener('click', () => {
        if (this.sortKey === col.key) this.sortDir = -this.sortDir;
        else { this.sortKey = col.key; this.sortDir = col.num ? -1 : 1; }
        this.vt.rebuildHead();
        this.apply();
        const again = this.vt.headRow.querySelector('button[data-sort="' + col.key + '"]');
        if (again) again.focus();
      });
      th.append(b);
      tr.append(th);
    }
  }

  buildRow(i) {
    const k = this.order[i];
    const u = this.result.units[k];
    const tr = el('tr', { 'data-unit': k, 'data-score': String(u.score), 'data-status': u.status, class: 'status-' + String(u.status).replace(/\s+/g, '-') + (k === this.selected ? ' selected' : '') });
    const nameBtn = el('button', { type: 'button', class: 'unit-link', 'data-unit': k, 'aria-label': 'Report for ' + u.name, 'aria-current': k === this.selected ? 'true' : null }, u.name);
    nameBtn.addEventListener('click', () => this.select(k));
    tr.addEventListener('click', (e) => { if (e.target.tagName !== 'BUTTON') this.select(k); });
    const sup = superValue(u);
    const cert = u.certificate || {};
    tr.append(
      el('th', { scope: 'row', class: 'col-name' }, nameBtn),
      el('td', { class: 'num col-score' }, u.status === 'not solved' ? '—' : fmt(u.score, 4)),
      el('td', { class: 'col-status' }, el('span', { class: 'status-chip' }, STATUS_WORDS[u.status] || String(u.status))),
      el('td', { class: 'col-scaleClass' }, u.scaleClass ? (SCALE_WORDS[u.scaleClass] || u.scaleClass) + ' (' + u.scaleClass + ')' : '—'),
      el('td', { class: 'num col-scaleEfficiency' }, u.scaleEfficiency ? fmt(u.scaleEfficiency, 4) : '—'),
      el('td', { class: 'num col-super', title: u.superNote || '' }, sup !== null ? fmt(sup, 4) : u.superNote ? 'none' : '—'),
      el('td', { class: 'col-peers', title: (u.peers || []).map((p) => p.name).join(', ') }, (u.peers || []).map((p) => p.name).join(', ') || '—'),
      el('td', { class: 'col-verified ' + (cert.verified ? 'ok' : 'not-ok') }, cert.verified ? '✓ yes' : '✗ no'),
    );
    return tr;
  }

  select(k) {
    const prev = this.selected;
    this.selected = k;
    for (const tr of this.vt.rows.values()) {
      const is = Number(tr.getAttribute('data-unit')) === k;
      tr.classList.toggle('selected', is);
      const b = tr.querySelector('button.unit-link');
      if (is) b.setAttribute('aria-current', 'true');
      else b.removeAttribute('aria-current');
    }
    if (prev !== k) this.onSelect(k);
  }

  // onKey moves focus between rows with the arrow keys.
  onKey(e) {
    if (e.key !== 'ArrowDown' && e.key !== 'ArrowUp') return;
    const tr = e.target.closest('tbody tr');
    if (!tr) return;
    const k = Number(tr.getAttribute('data-unit'));
    const pos = this.order.indexOf(k);
    const next = pos + (e.key === 'ArrowDown' ? 1 : -1);
    if (next < 0 || next >= this.order.length) return;
    e.preventDefault();
    const row = this.vt.rowElement(next);
    if (row) row.querySelector('button.unit-link').focus();
  }
}
