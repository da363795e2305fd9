// The unit report: the engine's explanation in plain sentences, the targets
// table, the weights and their shares, the peers and the verification.

import { $, el, clear, fmt, fmtAuto, pct } from './dom.js';
import { pick } from './studyview.js';

// explanationBlocks turns the engine's unit report ({summary, sections:
// [{title, sentences}]}, or plain text) into titled paragraphs.
export function explanationBlocks(rep) {
  if (!rep) return [];
  if (typeof rep === 'string') return rep.split(/\n\s*\n|\n/).filter((s) => s.trim()).map((text) => ({ title: '', text }));
  const blocks = [];
  const summary = pick(rep, 'summary', 'Summary');
  if (summary) blocks.push({ title: '', text: String(summary), lead: true });
  for (const sec of pick(rep, 'sections', 'Sections') || []) {
    const sentences = pick(sec, 'sentences', 'Sentences') || [];
    if (sentences.length) blocks.push({ title: String(pick(sec, 'title', 'Title') || ''), text: sentences.join(' ') });
  }
  return blocks;
}

export class UnitReport {
  constructor() {
    this.panel = $('unit-report');
  }

  clear() {
    clear($('unit-body'));
    $('unit-empty').hidden = false;
  }

  // show renders unit u of the result; rep is eng.explain's report (or an
  // error object when the engine could not explain).
  show(u, rep, model) {
    $('unit-empty').hidden = true;
    const body = clear($('unit-body'));
    body.append(el('h4', { class: 'unit-title' }, [
      el('span', { class: 'unit-name' }, u.name), ' ',
      el('span', { class: 'status-chip status-' + String(u.status).replace(/\s+/g, '-') }, u.status),
    ]));
    const score = el('p', { class: 'unit-score' }, [
      'Score ', el('strong', { 'data-score': String(u.score) }, u.status === 'not solved' ? '—' : fmt(u.score, 4)),
    ]);
    if (u.expansion) score.append(' (outputs could grow by a factor of ' + fmt(u.expansion, 4) + ')');
    body.append(score);
    if (u.problem) body.append(el('p', { class: 'problem' }, u.problem));

    const blocks = explanationBlocks(rep && rep.error ? null : rep);
    const expl = el('div', { class: 'explanation' });
    for (const b of blocks) {
      expl.append(el('p', { class: b.lead ? 'lead-sentence' : '' }, b.title ? [el('strong', null, b.title + '. '), b.text] : b.text));
    }
    if (!blocks.length) {
      expl.append(el('p', { class: 'muted' }, rep && rep.error ? 'The engine could not explain this unit: ' + rep.error : 'No explanation is available for this unit.'));
    }
    const left = el('div', { class: 'report-words' }, [el('h5', null, 'In plain words'), expl]);
    const right = el('div', { class: 'report-side' });
    const targets = el('div', { class: 'report-targets' });
    const weights = el('div', { class: 'report-weights' });
    body.append(el('div', { class: 'report-tables' }, [left, right, targets, weights]));

    if ((u.peers || []).length) {
      right.append(el('h5', null, 'Peers to learn from'));
      const ul = el('ul', { class: 'peer-list' });
      for (const p of u.peers) ul.append(el('li', null, [el('span', { class: 'unit-name' }, p.name), ' — weight ' + fmt(p.lambda, 4)]));
      right.append(ul);
    }

    targets.append(el('h5', null, 'Targets'));
    targets.append(this.targetsTable(u, model));

    const ws = [...(u.inputWeights || []).map((w) => ['input', w]), ...(u.outputWeights || []).map((w) => ['output', w])];
    if (ws.length) {
      weights.append(el('h5', null, 'Weights the unit is judged by'));
      const t = el('table', { class: 'grid small' }, [
        el('caption', { class: 'visually-hidden' }, 'Weights and shares for ' + u.name),
        el('thead', null, el('tr', null, [el('th', { scope: 'col' }, 'Measure'), el('th', { scope: 'col' }, 'Side'), el('th', { scope: 'col', class: 'num' }, 'Weight'), el('th', { scope: 'col', class: 'num' }, 'Share')])),
      ]);
      const tb = el('tbody');
      for (const [side, w] of ws) {
        tb.append(el('tr', null, [el('th', { scope: 'row' }, w.measure), el('td', null, side), el('td', { class: 'num' }, fmtSig(w.weight)), el('td', { class: 'num' }, shareBar(w.share))]));
      }
      t.append(tb);
      weights.append(t);
      weights.append(el('p', { class: 'muted small' }, 'Shares show how much of the unit\'s weighted inputs (or outputs) each measure carries.'));
    }

    const c = u.certificate || {};
    right.append(el('h5', null, 'Verification'));
    right.append(el('p', { class: 'verify ' + (c.verified ? 'ok' : 'not-ok') }, c.verified
      ? '✓ Verified: an independent check of this result found the solution consistent (largest errors ' + fmtSig(c.primalError) + ' and ' + fmtSig(c.dualError) + ', gap ' + fmtSig(c.gap) + ', within ' + fmtSig(c.tolerance) + ').'
      : '✗ Not verified: the independent check did not confirm this result (largest errors ' + fmtSig(c.primalError) + ' and ' + fmtSig(c.dualError) + ', gap ' + fmtSig(c.gap) + ', tolerance ' + fmtSig(c.tolerance) + '). Treat it with caution.'));
  }

  targetsTable(u) {
    const t = el('table', { class: 'grid small targets' }, [
      el('caption', { class: 'visually-hidden' }, 'Targets for ' + u.name),
      el('thead', null, el('tr', null, [
        el('th', { scope: 'col' }, 'Measure'), el('th', { scope: 'col', class: 'num' }, 'Today'),
        el('th', { scope: 'col', class: 'num' }, 'Proportional change'), el('th', { scope: 'col', class: 'num' }, 'Further slack'),
        el('th', { scope: 'col', class: 'num' }, 'Target'), el('th', { scope: 'col', class: 'num' }, 'Change'),
      ])),
    ]);
    const tb = el('tbody');
    const add = (side, list) => {
      for (const m of list || []) {
        tb.append(el('tr', { class: 'side-' + side }, [
          el('th', { scope: 'row' }, [m.measure, el('span', { class: 'side' }, ' ' + side)]),
          el('td', { class: 'num' }, fmtAuto(m.value)),
          el('td', { class: 'num' }, fmtAuto(m.radial)),
          el('td', { class: 'num' }, fmtAuto(m.slack)),
          el('td', { class: 'num' }, fmtAuto(m.target)),
          el('td', { class: 'num' }, pct(m.changePercent)),
        ]));
      }
    };
    add('input', u.inputs);
    add('output', u.outputs);
    t.append(tb);
    return t;
  }
}

function fmtSig(v) {
  if (typeof v !== 'number' || !Number.isFinite(v)) return '—';
  if (v === 0) return '0';
  const a = Math.abs(v);
  return a >= 1e-3 && a < 1e6 ? String(Number(v.toPrecision(4))) : v.toExponential(2);
}

function shareBar(share) {
  const p = typeof share === 'number' && Number.isFinite(share) ? share * 100 : NaN;
  const bar = el('span', { class: 'share-bar', 'aria-hidden': 'true' });
  const fill = el('span', { class: 'share-fill' });
  fill.style.width = Math.max(0, Math.min(100, p || 0)) + '%';
  bar.append(fill);
  return el('span', { class: 'share' }, [bar, Number.isFinite(p) ? p.toFixed(1) + '%' : '—']);
}
