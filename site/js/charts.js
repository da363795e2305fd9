// Charts drawn as SVG from the engine's results: the two-measure chart with
// its frontier outline, the score histogram and how often each unit is named
// as a peer. Colours and fonts are attributes (not CSS classes) so a saved
// SVG or PNG looks the same as the page.

import { svg, clear, fmt, fmtAuto } from './dom.js';
import { ioFrontier, lowerLeftFrontier, upperRightFrontier } from './geometry.js';

export const COLORS = {
  ink: '#1d2a33',
  grid: '#d5dde2',
  axis: '#5b6b75',
  frontier: '#0b6e75',
  efficient: '#0b6e75',
  other: '#7d8f9b',
  selected: '#b34700',
  bar: '#2f7f86',
  barOne: '#0b6e75',
  fill: '#ffffff',
};
const FONT = 'system-ui, -apple-system, "Segoe UI", Roboto, sans-serif';

const FULL_W = 640;
const FULL_H = 420;
const SMALL_W = 480;
const SMALL_H = 340;
const M = { top: 20, right: 24, bottom: 56, left: 72 };

// niceTicks returns about n round tick values from 0 to at least max.
export function niceTicks(max, n = 5) {
  if (!(max > 0) || !Number.isFinite(max)) return [0, 1];
  const raw = max / n;
  const mag = Math.pow(10, Math.floor(Math.log10(raw)));
  const step = [1, 2, 2.5, 5, 10].map((s) => s * mag).find((s) => s >= raw) || raw;
  const ticks = [];
  for (let v = 0; v <= max + step * 1e-9; v += step) ticks.push(Number(v.toPrecision(12)));
  if (ticks[ticks.length - 1] < max) ticks.push(Number((ticks[ticks.length - 1] + step).toPrecision(12)));
  return ticks;
}

function tickText(v) {
  const a = Math.abs(v);
  if (a === 0) return '0';
  if (a >= 1e6 || a < 1e-3) return v.toExponential(1);
  return String(Number(v.toPrecision(6)));
}

// fitLabel shortens an axis label to about max characters, keeping the
// whole text in a <title> for hover and screen readers.
function fitLabel(text, max) {
  const t = String(text);
  if (t.length <= max) return t;
  return [t.slice(0, Math.max(1, Math.floor(max) - 1)) + '…', svg('title', null, t)];
}

let chartSerial = 0;

// frame makes an SVG root with a white background, axes, grid and labels.
function frame(label, xMax, yMax, xLabel, yLabel, xTicks = true, W = FULL_W, H = FULL_H) {
  const id = 'c' + ++chartSerial;
  const root = svg('svg', { xmlns: 'http://www.w3.org/2000/svg', viewBox: `0 0 ${W} ${H}`, width: W, height: H, role: 'img', 'aria-label': label, 'font-family': FONT, 'font-size': 12, class: 'chart-svg' });
  root.append(svg('title', null, label));
  root.append(svg('rect', { x: 0, y: 0, width: W, height: H, fill: COLORS.fill }));
  const xt = niceTicks(xMax), yt = niceTicks(yMax);
  const x1 = xt[xt.length - 1], y1 = yt[yt.length - 1];
  const pw = W - M.left - M.right, ph = H - M.top - M.bottom;
  const sx = (v) => M.left + (v / x1) * pw;
  const sy = (v) => M.top + ph - (v / y1) * ph;
  const grid = svg('g', { stroke: COLORS.grid, 'stroke-width': 1 });
  const labels = svg('g', { fill: COLORS.axis });
  for (const v of xTicks ? xt : []) {
    grid.append(svg('line', { x1: sx(v), x2: sx(v), y1: M.top, y2: M.top + ph }));
    labels.append(svg('text', { x: sx(v), y: M.top + ph + 16, 'text-anchor': 'middle' }, tickText(v)));
  }
  for (const v of yt) {
    grid.append(svg('line', { x1: M.left, x2: M.left + pw, y1: sy(v), y2: sy(v) }));
    labels.append(svg('text', { x: M.left - 6, y: sy(v) + 4, 'text-anchor': 'end' }, tickText(v)));
  }
  root.append(grid, labels);
  root.append(svg('line', { x1: M.left, x2: M.left + pw, y1: M.top + ph, y2: M.top + ph, stroke: COLORS.axis }));
  root.append(svg('line', { x1: M.left, x2: M.left, y1: M.top, y2: M.top + ph, stroke: COLORS.axis }));
  root.append(svg('text', { x: M.left + pw / 2, y: H - 12, 'text-anchor': 'middle', fill: COLORS.ink, 'font-size': 13 }, fitLabel(xLabel, pw / 7.2)));
  root.append(svg('text', { x: 16, y: M.top + ph / 2, 'text-anchor': 'middle', fill: COLORS.ink, 'font-size': 13, transform: `rotate(-90 16 ${M.top + ph / 2})` }, fitLabel(yLabel, ph / 7.2)));
  const clip = svg('clipPath', { id: id + '-clip' }, svg('rect', { x: M.left, y: M.top, width: pw, height: ph }));
  const defs = svg('defs', null, [clip,
    svg('marker', { id: id + '-arrow', viewBox: '0 0 10 10', refX: 9, refY: 5, markerWidth: 7, markerHeight: 7, orient: 'auto-start-reverse' },
      svg('path', { d: 'M0,0 L10,5 L0,10 z', fill: COLORS.selected }))]);
  root.prepend(defs);
  return { root, sx, sy, id, pw, ph, W, H };
}

const isEff = (u) => u.status === 'efficient' || u.status === 'weakly efficient';

// measureChoices lists the measures the chart menus offer.
export function measureChoices(result) {
  const u = result.units.find((x) => (x.inputs || []).length || (x.outputs || []).length) || result.units[0] || {};
  return { inputs: (u.inputs || []).map((t) => t.measure), outputs: (u.outputs || []).map((t) => t.measure) };
}

// pointsFor maps each unit to chart coordinates (today and target) for a
// chart kind: 'io' one input (a) against one output (b); 'ii' inputs a and b
// per unit of output c; 'oo' outputs a and b per unit of input c.
export function pointsFor(result, kind, a, b, c) {
  const get = (u, side, j, key) => {
    const list = side === 'in' ? u.inputs : u.outputs;
    return list && list[j] ? list[j][key] : NaN;
  };
  return result.units.map((u, k) => {
    const at = (key) => {
      if (kind === 'io') return [get(u, 'in', a, key), get(u, 'out', b, key)];
      if (kind === 'ii') { const d = get(u, 'out', c, key); return [get(u, 'in', a, key) / d, get(u, 'in', b, key) / d]; }
      const d = get(u, 'in', c, key);
      return [get(u, 'out', a, key) / d, get(u, 'out', b, key) / d];
    };
    return { k, u, p: at('value'), t: at('target') };
  });
}

const finitePt = (p) => p && Number.isFinite(p[0]) && Number.isFinite(p[1]) && p[0] >= 0 && p[1] >= 0;

// frontierChart draws the two-measure chart. opts: {kind, a, b, c, names:
// {x, y}, model, selected, onSelect, frontier (optional points from the
// engine)}.
export function frontierChart(result, opts) {
  const pts = pointsFor(result, opts.kind, opts.a, opts.b, opts.c);
  const shown = pts.filter((q) => finitePt(q.p));
  const xs = shown.map((q) => q.p[0]), ys = shown.map((q) => q.p[1]);
  const sel = shown.find((q) => q.k === opts.selected);
  if (sel && finitePt(sel.t)) { xs.push(sel.t[0]); ys.push(sel.t[1]); }
  const xMax = Math.max(0, ...xs) * 1.05 || 1, yMax = Math.max(0, ...ys) * 1.08 || 1;
  const label = 'Chart of ' + opts.names.y + ' against ' + opts.names.x + ' for ' + shown.length + ' units, with the frontier of these two measures';
  const f = frame(label, xMax, yMax, opts.names.x, opts.names.y);
  const { root, sx, sy } = f;

  const effPts = shown.filter((q) => isEff(q.u)).map((q) => q.p);
  const all = shown.map((q) => q.p);
  let line = opts.frontier;
  if (!line) {
    const m = opts.model || {};
    if (opts.kind === 'io') line = ioFrontier(all, m.returns, m.lower, m.upper, xMax);
    else if (opts.kind === 'ii') line = lowerLeftFrontier(all, xMax, yMax);
    else line = upperRightFrontier(all);
  }
  const plot = svg('g', { 'clip-path': `url(#${f.id}-clip)` });
  if (line && line.length) {
    const d = line.map((p, i) => (i ? 'L' : 'M') + sx(p[0]).toFixed(2) + ',' + sy(p[1]).toFixed(2)).join(' ');
    plot.append(svg('path', { d, class: 'frontier-line', fill: 'none', stroke: COLORS.frontier, 'stroke-width': 2.5, 'stroke-linejoin': 'round' },
      svg('title', null, 'Frontier of ' + opts.names.x + ' and ' + opts.names.y + ' alone')));
  }
  const marks = svg('g', { class: 'marks' });
  const focusable = shown.length <= 200;
  for (const q of shown) {
    const eff = isEff(q.u);
    const tip = q.u.name + ': ' + opts.names.x + ' ' + fmtAuto(q.p[0]) + ', ' + opts.names.y + ' ' + fmtAuto(q.p[1]) + ', score ' + fmt(q.u.score, 3) + ' (' + q.u.status + ')';
    const c = svg('circle', {
      cx: sx(q.p[0]).toFixed(2), cy: sy(q.p[1]).toFixed(2), r: q.k === opts.selected ? 7 : 5,
      fill: q.k === opts.selected ? COLORS.selected : eff ? COLORS.efficient : COLORS.fill,
      stroke: q.k === opts.selected ? COLORS.selected : eff ? COLORS.efficient : COLORS.other,
      'stroke-width': 2, class: 'unit-mark' + (eff ? ' efficient' : '') + (q.k === opts.selected ? ' selected' : ''),
      'data-unit': q.k, 'data-tip': tip, tabindex: focusable ? 0 : null, role: focusable ? 'button' : null, 'aria-label': focusable ? tip : null,
    }, svg('title', null, tip));
    marks.append(c);
  }
  plot.append(marks);
  if (sel && finitePt(sel.t)) {
    const [x0, y0, x1, y1] = [sx(sel.p[0]), sy(sel.p[1]), sx(sel.t[0]), sy(sel.t[1])];
    const moved = Math.hypot(x1 - x0, y1 - y0) > 1;
    const g = svg('g', { class: 'target-path' });
    if (moved) g.append(svg('line', { x1: x0, y1: y0, x2: x1, y2: y1, stroke: COLORS.selected, 'stroke-width': 2, 'stroke-dasharray': '6 4', 'marker-end': `url(#${f.id}-arrow)` }));
    g.append(svg('circle', { cx: x1, cy: y1, r: 6, fill: 'none', stroke: COLORS.selected, 'stroke-width': 2, class: 'target-mark' },
      svg('title', null, 'Target for ' + sel.u.name + ': ' + opts.names.x + ' ' + fmtAuto(sel.t[0]) + ', ' + opts.names.y + ' ' + fmtAuto(sel.t[1]))));
    g.append(svg('title', null, 'Path of ' + sel.u.name + ' to its target'));
    plot.append(g);
    marks.append(marks.querySelector(`[data-unit="${sel.k}"]`)); // selected mark on top
  }
  root.append(plot);
  root.append(legend([
    ['line', COLORS.frontier, 'frontier of the measures shown'],
    ['dot', COLORS.efficient, 'efficient unit'],
    ['ring', COLORS.other, 'other unit'],
    ['dot', COLORS.selected, 'chosen unit and its target'],
  ]));
  return { svg: root, placed: shown.length, missing: pts.length - shown.length };
}

function legend(items) {
  const g = svg('g', { transform: `translate(${M.left + 8}, ${M.top + 6})`, 'font-size': 11, fill: COLORS.ink });
  g.append(svg('rect', { x: -4, y: -2, width: 206, height: items.length * 16 + 4, fill: COLORS.fill, 'fill-opacity': 0.85, stroke: COLORS.grid }));
  items.forEach(([shape, color, text], i) => {
    const y = i * 16 + 8;
    if (shape === 'line') g.append(svg('line', { x1: 2, x2: 18, y1: y, y2: y, stroke: color, 'stroke-width': 2.5 }));
    else g.append(svg('circle', { cx: 10, cy: y, r: 4.5, fill: shape === 'dot' ? color : COLORS.fill, stroke: color, 'stroke-width': 2 }));
    g.append(svg('text', { x: 24, y: y + 4 }, text));
  });
  return g;
}

// histogram draws how the scores are spread: ten bands below 1 and a bar for
// the units that score exactly 1.
export function histogram(result) {
  const bins = new Array(11).fill(0);
  let skipped = 0;
  for (const u of result.units) {
    const s = u.score;
    if (u.status === 'not solved' || typeof s !== 'number' || !Number.isFinite(s)) { skipped++; continue; }
    if (isEff(u)) bins[10]++;
    else bins[Math.min(9, Math.max(0, Math.floor(s * 10)))]++;
  }
  const yMax = Math.max(1, ...bins);
  const label = 'Histogram of scores for ' + (result.units.length - skipped) + ' units';
  const f = frame(label, 11, yMax * 1.1, 'Score (last bar: units on the frontier)', 'Number of units', false, SMALL_W, SMALL_H);
  const { root, sy } = f;
  const bw = f.pw / 11;
  const base = M.top + f.ph;
  const g = svg('g', { class: 'bars' });
  bins.forEach((n, i) => {
    const x = M.left + i * bw;
    const band = i === 10 ? 'score 1 (on the frontier)' : 'score ' + (i / 10).toFixed(1) + ' to under ' + ((i + 1) / 10).toFixed(1);
    const tip = n + (n === 1 ? ' unit, ' : ' units, ') + band;
    g.append(svg('rect', { x: x + 2, y: sy(n), width: bw - 4, height: Math.max(0, sy(0) - sy(n)), fill: i === 10 ? COLORS.barOne : COLORS.bar, class: 'bar', 'data-tip': tip, 'data-count': n }, svg('title', null, tip)));
    if (n > 0) g.append(svg('text', { x: x + bw / 2, y: sy(n) - 4, 'text-anchor': 'middle', fill: COLORS.ink, 'font-size': 11 }, String(n)));
    if (i < 10 && i % 2 === 0) g.append(svg('text', { x, y: base + 16, 'text-anchor': 'middle', fill: COLORS.axis }, (i / 10).toFixed(1)));
    if (i < 10) g.append(svg('line', { x1: x, x2: x, y1: base, y2: base + 4, stroke: COLORS.axis }));
  });
  g.append(svg('text', { x: M.left + 10 * bw + bw / 2, y: base + 16, 'text-anchor': 'middle', fill: COLORS.ink, 'font-weight': 700 }, '1'));
  root.append(g);
  return { svg: root, skipped };
}

// peerChart draws, for the units most often named as a peer, how many
// other units name them.
export function peerChart(result, limit = 20) {
  const list = result.units.filter((u) => u.peerCount > 0).sort((a, b) => b.peerCount - a.peerCount || String(a.name).localeCompare(String(b.name))).slice(0, limit);
  const rowH = 22;
  const h = Math.max(120, list.length * rowH + 70);
  const W = SMALL_W;
  const left = 150, right = 36;
  const max = Math.max(1, ...list.map((u) => u.peerCount));
  const ticks = niceTicks(max, 5);
  const top = ticks[ticks.length - 1];
  const sx = (v) => left + (v / top) * (W - left - right);
  const label = 'Bar chart: how many units name each unit as a peer (' + list.length + ' units shown)';
  const root = svg('svg', { xmlns: 'http://www.w3.org/2000/svg', viewBox: `0 0 ${W} ${h}`, width: W, height: h, role: 'img', 'aria-label': label, 'font-family': FONT, 'font-size': 12, class: 'chart-svg' });
  root.append(svg('title', null, label), svg('rect', { x: 0, y: 0, width: W, height: h, fill: COLORS.fill }));
  for (const t of ticks) {
    root.append(svg('line', { x1: sx(t), x2: sx(t), y1: 20, y2: h - 40, stroke: COLORS.grid }));
    root.append(svg('text', { x: sx(t), y: h - 26, 'text-anchor': 'middle', fill: COLORS.axis }, tickText(t)));
  }
  root.append(svg('text', { x: (left + W - right) / 2, y: h - 8, 'text-anchor': 'middle', fill: COLORS.ink, 'font-size': 13 }, 'Number of units that name it as a peer'));
  if (!list.length) root.append(svg('text', { x: W / 2, y: 60, 'text-anchor': 'middle', fill: COLORS.ink }, 'No unit is named as a peer by another unit.'));
  list.forEach((u, i) => {
    const y = 24 + i * rowH;
    const name = String(u.name);
    const short = name.length > 21 ? name.slice(0, 20) + '…' : name;
    const tip = name + ': named as a peer by ' + u.peerCount + (u.peerCount === 1 ? ' unit' : ' units');
    root.append(svg('text', { x: left - 8, y: y + 14, 'text-anchor': 'end', fill: COLORS.ink }, [short, svg('title', null, name)]));
    root.append(svg('rect', { x: left, y: y + 2, width: Math.max(1, sx(u.peerCount) - left), height: rowH - 6, fill: COLORS.bar, class: 'bar', 'data-tip': tip, 'data-unit': u.index }, svg('title', null, tip)));
    root.append(svg('text', { x: sx(u.peerCount) + 4, y: y + 14, fill: COLORS.ink, 'font-size': 11 }, String(u.peerCount)));
  });
  return { svg: root, shown: list.length, total: result.units.filter((u) => u.peerCount > 0).length };
}

// clearChart empties a chart holder.
export function clearChart(holder) {
  clear(holder);
}
