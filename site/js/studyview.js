// StudyView pairs the study (the engine's study file form: units, measures
// with roles, values, extra text columns, leftOut, settings) with the table
// as the user typed it, so the page can show each cell's text and put every
// message on the cell it concerns. It also applies the user's edits to the
// study: roles, the unit-name column, and who is left out. It moves data
// around; it computes nothing.

// pick returns the first property of o that is defined, trying each name
// (the bridge may use camelCase or Go's own field names).
export function pick(o, ...names) {
  if (!o) return undefined;
  for (const n of names) if (o[n] !== undefined && o[n] !== null) return o[n];
  return undefined;
}

// normTable reads the bridge's table object into one plain shape.
export function normTable(t) {
  if (!t) return null;
  const header = pick(t, 'header', 'Header') || [];
  const rows = (pick(t, 'rows', 'Rows') || []).map((r, k) => ({
    line: pick(r, 'line', 'Line') ?? k + 2,
    cells: pick(r, 'cells', 'Cells') || [],
  }));
  const columns = (pick(t, 'columns', 'Columns') || []).map((c) => ({
    name: pick(c, 'name', 'Name') ?? '',
    numeric: !!pick(c, 'numeric', 'Numeric'),
    decimalComma: !!pick(c, 'decimalComma', 'DecimalComma'),
    percent: !!pick(c, 'percent', 'Percent'),
    currency: pick(c, 'currency', 'Currency') || '',
    note: pick(c, 'note', 'Note') || '',
  }));
  return { header, rows, columns, nameColumn: pick(t, 'nameColumn', 'NameColumn') ?? -1 };
}

// normProblem reads one table problem.
export function normProblem(p) {
  return {
    row: pick(p, 'row', 'Row') || 0,
    column: pick(p, 'column', 'Column') || 0,
    text: pick(p, 'text', 'Text') ?? '',
    severity: pick(p, 'severity', 'Severity') || 'error',
    // reason is the plain reason alone (the page shows the place itself).
    message: String(pick(p, 'reason', 'Reason', 'message', 'Message', 'error', 'Err') ?? 'problem'),
  };
}

// columnNote says in plain words how a column's numbers were read.
export function columnNote(c) {
  if (!c) return '';
  if (c.note) return c.note;
  const parts = [];
  if (c.decimalComma) parts.push('decimal comma');
  if (c.percent) parts.push('percent signs removed');
  if (c.currency) parts.push('currency sign ' + c.currency + ' removed');
  if (parts.length === 0 && c.numeric) parts.push('plain numbers');
  return parts.join('; ');
}

export const ROLE_WORDS = {
  input: 'Input',
  output: 'Output',
  unused: 'Not used',
  names: 'Unit names',
  text: 'Text (not used)',
};

export class StudyView {
  constructor(study, table, problems) {
    this.study = study;
    this.table = normTable(table);
    const ps = problems || pick(table, 'problems', 'Problems') || [];
    this.problems = ps.map(normProblem);
    this.issues = [];
    this.nameTitle = 'Unit';
    if (this.table && this.table.nameColumn >= 0) {
      this.nameTitle = this.table.header[this.table.nameColumn] || 'Unit';
    }
    this.rebuild();
  }

  get units() { return this.study.units || []; }
  get measures() { return this.study.measures || []; }
  get extra() { return this.study.extra || []; }

  // rebuild works out the display columns and their source columns.
  rebuild() {
    const t = this.table;
    const used = new Set();
    const source = (name, fallback) => {
      if (!t) return -1;
      let k = t.header.findIndex((h, idx) => h === name && !used.has(idx));
      if (k < 0 && fallback >= 0 && fallback < t.header.length && !used.has(fallback)) k = fallback;
      if (k >= 0) used.add(k);
      return k;
    };
    const cols = [];
    const nameSrc = t && t.nameColumn >= 0 && this.nameTitle === t.header[t.nameColumn] ? t.nameColumn : -1;
    if (nameSrc >= 0) used.add(nameSrc);
    cols.push({ kind: 'name', index: -1, title: this.nameTitle, source: nameSrc });
    this.measures.forEach((m, j) => cols.push({ kind: 'measure', index: j, title: m.name, source: source(m.name, -1) }));
    this.extra.forEach((x, k) => cols.push({ kind: 'text', index: k, title: x.name, source: source(x.name, -1) }));
    if (t) {
      const order = (c) => (c.source >= 0 ? c.source : 1e6 + cols.indexOf(c));
      cols.sort((a, b) => order(a) - order(b));
    }
    this.columns = cols;
    this.rowOfLine = new Map();
    if (t) t.rows.forEach((r, i) => this.rowOfLine.set(r.line, i));
    this.indexMarks();
  }

  role(col) {
    if (col.kind === 'name') return 'names';
    if (col.kind === 'text') return 'text';
    return this.measures[col.index].role || 'unused';
  }

  roleGuessed(col) {
    return col.kind === 'measure' && !!this.measures[col.index].roleGuessed;
  }

  columnNote(col) {
    if (!this.table || col.source < 0) return col.kind === 'measure' ? 'numbers' : 'text';
    return columnNote(this.table.columns[col.source]) || (col.kind === 'measure' ? 'numbers' : 'text');
  }

  // cellText is what the user typed, when known; otherwise the stored value.
  cellText(i, col) {
    const t = this.table;
    if (t && col.source >= 0 && t.rows.length === this.units.length) {
      const cells = t.rows[i] ? t.rows[i].cells : [];
      return cells[col.source] ?? '';
    }
    if (col.kind === 'name') return this.units[i] ?? '';
    if (col.kind === 'text') return (this.extra[col.index].cells || [])[i] ?? '';
    const v = ((this.study.values || [])[i] || [])[col.index];
    return v === null || v === undefined || Number.isNaN(v) ? '' : String(v);
  }

  sourceRow(i) {
    if (this.table && this.table.rows[i]) return this.table.rows[i].line;
    return i + 1;
  }

  isLeftOut(i) {
    const name = this.units[i];
    return (this.study.leftOut || []).includes(name);
  }

  setLeftOut(i, out) {
    const name = this.units[i];
    const list = (this.study.leftOut || []).filter((n) => n !== name);
    if (out) list.push(name);
    this.study.leftOut = list;
  }

  leftOutIndices() {
    const set = new Set(this.study.leftOut || []);
    const idx = [];
    this.units.forEach((u, i) => { if (set.has(u)) idx.push(i); });
    return idx;
  }

  // setRole changes a column's role; 'names' makes it the unit-name column.
  setRole(col, role) {
    const s = this.study;
    if (role === 'names' && col.kind !== 'name') {
      this.makeNames(col);
      return;
    }
    if (col.kind === 'measure') {
      s.measures[col.index] = { ...s.measures[col.index], role, roleGuessed: false };
      return;
    }
    if (col.kind === 'name' && role !== 'names') {
      // The names become a text column; units are numbered instead.
      const out = this.leftOutIndices();
      s.extra = [...this.extra, { name: this.nameTitle, cells: this.units.map((u, i) => this.cellText(i, col)) }];
      s.units = this.units.map((_, i) => 'Unit ' + (i + 1));
      this.nameTitle = 'Unit';
      s.leftOut = out.map((i) => s.units[i]);
      this.rebuild();
    }
  }

  makeNames(col) {
    const s = this.study;
    const out = this.leftOutIndices();
    const names = this.units.map((_, i) => this.cellText(i, col).trim() || 'Unit ' + (i + 1));
    const oldCol = this.columns.find((c) => c.kind === 'name');
    const oldNames = this.units.map((u, i) => this.cellText(i, oldCol));
    const extra = [...this.extra];
    if (col.kind === 'text') extra.splice(col.index, 1);
    if (col.kind === 'measure') {
      s.measures = this.measures.filter((_, j) => j !== col.index);
      s.values = (s.values || []).map((row) => row.filter((_, j) => j !== col.index));
    }
    extra.push({ name: this.nameTitle, cells: oldNames });
    s.extra = extra;
    s.units = names;
    this.nameTitle = col.title;
    s.leftOut = out.map((i) => names[i]);
    if (this.table && col.source >= 0) this.table.nameColumn = col.source;
    this.rebuild();
  }

  columnOfMeasure(j) {
    return this.columns.findIndex((c) => c.kind === 'measure' && c.index === j);
  }

  setIssues(issues) {
    this.issues = (issues || []).map((x) => ({
      severity: pick(x, 'severity', 'Severity') || 'error',
      code: pick(x, 'code', 'Code') || '',
      message: String(pick(x, 'message', 'Message') ?? ''),
      units: pick(x, 'units', 'Units') || [],
      measures: pick(x, 'measures', 'Measures') || [],
    }));
    this.indexMarks();
  }

  // indexMarks builds the lookup of messages by cell, row and column. Each
  // message gets an id; marks point to message ids.
  indexMarks() {
    const msgs = [];
    const cell = new Map(); // "i:c" -> [msg]
    const row = new Map(); // i -> [msg]
    const col = new Map(); // c -> [msg]
    const add = (map, key, m) => { if (!map.has(key)) map.set(key, []); map.get(key).push(m); };
    for (const p of this.problems) {
      const i = this.rowOfLine.get(p.row);
      const c = p.column > 0 ? this.columns.findIndex((cc) => cc.source === p.column - 1) : -1;
      const m = { id: 'msg-' + msgs.length, severity: p.severity, message: p.message, from: 'table', unit: i ?? -1, col: c, srcRow: p.row, srcCol: p.column, text: p.text };
      msgs.push(m);
      if (i !== undefined && c >= 0) add(cell, i + ':' + c, m);
      else if (i !== undefined) add(row, i, m);
      else if (c >= 0) add(col, c, m);
    }
    for (const x of this.issues) {
      const cs = x.measures.map((j) => this.columnOfMeasure(j)).filter((c) => c >= 0);
      const m = { id: 'msg-' + msgs.length, severity: x.severity, message: x.message, from: 'study', unit: x.units.length ? x.units[0] : -1, col: cs.length ? cs[0] : -1 };
      msgs.push(m);
      if (x.units.length && cs.length) for (const i of x.units) for (const c of cs) add(cell, i + ':' + c, m);
      else if (x.units.length) for (const i of x.units) add(row, i, m);
      else for (const c of cs) add(col, c, m);
    }
    this.messages = msgs;
    this.cellMarks = cell;
    this.rowMarks = row;
    this.colMarks = col;
  }

  // hasErrors reports whether the engine's check of the study found an
  // error (a cell that could not be read is an error only while its unit
  // and measure take part, and the check says so itself).
  hasErrors() {
    return this.messages.some((m) => m.from === 'study' && m.severity === 'error');
  }
}
