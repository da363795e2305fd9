// The table preview: every column with its role (a labelled menu in the
// header) and how its numbers were read, every row with a checkbox to leave
// the unit out, and every message from reading or checking the table on the
// cell, row or column it concerns. Also the list of all messages (each links
// to its cell) and the list of units left out.

import { $, el, clear, hoverTips } from './dom.js';
import { VirtualTable } from './vtable.js';
import { ROLE_WORDS } from './studyview.js';

export class Preview {
  // onChange(kind) is called after the user edits roles or who is left out.
  constructor(onChange) {
    this.onChange = onChange;
    this.view = null;
    this.vt = new VirtualTable($('preview'), {
      className: 'grid preview-table',
      caption: 'Your table, one row per unit',
      buildHead: (tr) => this.buildHead(tr),
      buildRow: (i) => this.buildRow(i),
    });
    hoverTips($('preview'), 'data-msg');
  }

  show(view) {
    this.view = view;
    this.vt.rebuildHead();
    this.vt.setCount(view.units.length);
    this.vt.container.scrollTop = 0;
    this.refreshLists();
  }

  // refresh redraws after issues or roles changed.
  refresh() {
    if (!this.view) return;
    this.vt.keepFocus(() => {
      this.vt.rebuildHead();
      this.vt.invalidate();
    });
    this.refreshLists();
  }

  buildHead(tr) {
    tr.append(el('th', { scope: 'col', class: 'col-include' }, 'Include'));
    tr.append(el('th', { scope: 'col', class: 'col-rownum' }, 'Row'));
    const v = this.view;
    if (!v) return;
    v.columns.forEach((col, c) => {
      const id = 'role-' + c;
      const role = v.role(col);
      const select = el('select', { id, class: 'role-select role-' + role, 'data-col': c });
      const options = col.kind === 'measure' ? ['input', 'output', 'unused', 'names'] : col.kind === 'text' ? ['text', 'names'] : ['names', 'text'];
      for (const r of options) {
        const o = el('option', { value: r }, ROLE_WORDS[r]);
        if (r === role) o.selected = true;
        select.append(o);
      }
      select.addEventListener('change', () => {
        const next = select.value === 'text' ? 'unused' : select.value;
        v.setRole(col, next);
        this.onChange('roles');
      });
      const marks = v.colMarks.get(c) || [];
      const th = el('th', { scope: 'col', class: 'col-' + role + (marks.length ? ' marked ' + worst(marks) : ''), 'data-col': c }, [
        el('span', { class: 'col-title' }, col.title),
        el('label', { class: 'visually-hidden', for: id }, 'Role of column ' + col.title),
        select,
        el('span', { class: 'col-note' }, v.columnNote(col) + (v.roleGuessed(col) ? ' · role guessed' : '')),
      ]);
      if (marks.length) setMark(th, marks);
      tr.append(th);
    });
  }

  buildRow(i) {
    const v = this.view;
    const out = v.isLeftOut(i);
    const name = v.units[i];
    const rowMarks = v.rowMarks.get(i) || [];
    const tr = el('tr', { 'data-unit': i, class: (out ? 'is-left-out' : '') + (rowMarks.length ? ' marked-row ' + worst(rowMarks) : '') });
    const box = el('input', { type: 'checkbox', id: 'inc-' + i, 'aria-label': 'Include ' + name });
    box.checked = !out;
    box.addEventListener('change', () => {
      v.setLeftOut(i, !box.checked);
      this.vt.updateRow(i);
      this.refreshLists();
      this.onChange('left-out');
    });
    tr.append(el('td', { class: 'col-include' }, box));
    const rn = el('th', { scope: 'row', class: 'col-rownum' }, String(v.sourceRow(i)));
    if (rowMarks.length) setMark(rn, rowMarks);
    tr.append(rn);
    v.columns.forEach((col, c) => {
      const text = v.cellText(i, col);
      const td = el('td', { class: 'col-' + v.role(col) + (col.kind === 'measure' ? ' num' : ''), 'data-col': c }, text);
      const marks = v.cellMarks.get(i + ':' + c);
      if (marks) setMark(td, marks);
      tr.append(td);
    });
    return tr;
  }

  refreshLists() {
    const v = this.view;
    const list = clear($('issues'));
    if (!v.messages.length) list.append(el('li', { class: 'muted' }, 'No problems found.'));
    for (const m of v.messages) {
      const where = [];
      if (m.unit >= 0) where.push('row ' + v.sourceRow(m.unit) + ' (' + v.units[m.unit] + ')');
      else if (m.srcRow) where.push('row ' + m.srcRow);
      if (m.col >= 0) where.push('column ' + v.columns[m.col].title);
      const li = el('li', { class: 'issue ' + m.severity, 'data-msg-id': m.id }, [
        el('span', { class: 'badge ' + m.severity }, m.severity),
        ' ',
        el('span', { class: 'issue-text' }, m.message),
      ]);
      if (where.length) {
        const b = el('button', { type: 'button', class: 'linkish' }, 'Show ' + where.join(', '));
        b.addEventListener('click', () => this.focusCell(m.unit, m.col));
        li.append(' ', b);
      }
      list.append(li);
    }
    const out = clear($('left-out'));
    const idx = v.leftOutIndices();
    if (!idx.length) out.append(el('li', { class: 'muted' }, 'Nobody: every unit takes part.'));
    for (const i of idx) {
      const b = el('button', { type: 'button', class: 'linkish', 'aria-label': 'Bring back ' + v.units[i] }, 'Bring back');
      b.addEventListener('click', () => {
        v.setLeftOut(i, false);
        this.vt.updateRow(i);
        this.refreshLists();
        this.onChange('left-out');
      });
      out.append(el('li', { 'data-unit': i }, [el('span', { class: 'unit-name' }, v.units[i]), ' ', b]));
    }
    const n = v.units.length;
    $('preview-summary').textContent = n + (n === 1 ? ' unit, ' : ' units, ') + v.measures.filter((m) => m.role === 'input').length + ' inputs, ' +
      v.measures.filter((m) => m.role === 'output').length + ' outputs; ' + idx.length + ' left out.';
  }

  // focusCell scrolls to a unit's row and focuses the cell (or the row's
  // number when the message is about the whole row, or the column header).
  focusCell(i, c) {
    let target = null;
    if (i >= 0) {
      const tr = this.vt.rowElement(i);
      if (tr) target = c >= 0 ? tr.querySelector('td[data-col="' + c + '"]') : tr.querySelector('th');
    } else if (c >= 0) {
      target = this.vt.headRow.querySelector('th[data-col="' + c + '"]');
    }
    if (target) {
      target.scrollIntoView({ block: 'nearest', inline: 'nearest' });
      target.focus();
    }
  }
}

function worst(marks) {
  if (marks.some((m) => m.severity === 'error')) return 'sev-error';
  if (marks.some((m) => m.severity === 'warning')) return 'sev-warning';
  return 'sev-note';
}

// setMark highlights a cell and attaches its messages: visible on hover and
// focus (the cell becomes focusable) and read out by screen readers.
function setMark(node, marks) {
  const text = marks.map((m) => m.message).join(' · ');
  node.classList.add('marked', worst(marks));
  node.setAttribute('tabindex', '0');
  node.setAttribute('data-msg', text);
  node.setAttribute('data-msg-ids', marks.map((m) => m.id).join(' '));
  node.append(el('span', { class: 'visually-hidden' }, ' (' + text + ')'));
}
