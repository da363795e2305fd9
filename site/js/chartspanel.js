// The charts panel: the menus of the two-measure chart, the three charts,
// saving them, and choosing a unit by clicking its mark.

import { $, el, clear, hoverTips } from './dom.js';
import { frontierChart, histogram, peerChart, measureChoices } from './charts.js';
import { saveSVG, savePNG } from './chartsave.js';

export class ChartsPanel {
  constructor(onSelect) {
    this.onSelect = onSelect;
    this.result = null;
    this.selected = -1;
    for (const id of ['frontier-kind', 'frontier-a', 'frontier-b', 'frontier-c']) {
      $(id).addEventListener('change', () => {
        if (id === 'frontier-kind') this.fillMenus();
        this.drawFrontier();
      });
    }
    const holder = $('frontier-chart');
    holder.addEventListener('click', (e) => {
      const mark = e.target.closest('.unit-mark');
      if (mark) this.onSelect(Number(mark.getAttribute('data-unit')));
    });
    holder.addEventListener('keydown', (e) => {
      const mark = e.target.closest('.unit-mark');
      if (mark && (e.key === 'Enter' || e.key === ' ')) {
        e.preventDefault();
        this.onSelect(Number(mark.getAttribute('data-unit')));
      }
    });
    hoverTips($('charts-body'), 'data-tip');
    for (const b of document.querySelectorAll('[data-save]')) {
      b.addEventListener('click', async () => {
        const node = $(b.getAttribute('data-save') + '-chart').querySelector('svg');
        if (!node) return;
        const name = 'peerlens-' + b.getAttribute('data-save');
        try {
          if (b.getAttribute('data-format') === 'png') await savePNG(node, name);
          else saveSVG(node, name);
        } catch (err) {
          $('frontier-note').textContent = 'The chart could not be saved: ' + (err.message || err);
        }
      });
    }
  }

  show(result) {
    this.result = result;
    this.selected = -1;
    this.choices = measureChoices(result);
    const kind = $('frontier-kind');
    const can = { io: this.choices.inputs.length >= 1 && this.choices.outputs.length >= 1, ii: this.choices.inputs.length >= 2 && this.choices.outputs.length >= 1, oo: this.choices.outputs.length >= 2 && this.choices.inputs.length >= 1 };
    for (const o of kind.options) o.disabled = !can[o.value];
    if (!can[kind.value]) kind.value = Object.keys(can).find((k) => can[k]) || 'io';
    this.fillMenus();
    this.drawAll();
  }

  // fillMenus offers the measures that fit the chosen kind of chart.
  fillMenus() {
    const kind = $('frontier-kind').value;
    const { inputs, outputs } = this.choices;
    const lists = kind === 'io' ? [inputs, outputs, null] : kind === 'ii' ? [inputs, inputs, outputs] : [outputs, outputs, inputs];
    const labels = kind === 'io' ? ['Input (across)', 'Output (up)'] : kind === 'ii' ? ['Input across', 'Input up', 'Per unit of output'] : ['Output across', 'Output up', 'Per unit of input'];
    ['a', 'b', 'c'].forEach((key, n) => {
      const sel = $('frontier-' + key);
      const label = $('frontier-' + key + '-label');
      const list = lists[n];
      const before = sel.value;
      clear(sel);
      label.parentElement.hidden = !list;
      if (!list) return;
      label.textContent = labels[n];
      list.forEach((name, j) => sel.append(el('option', { value: j }, name)));
      const def = n === 1 && kind !== 'io' ? Math.min(1, list.length - 1) : 0;
      sel.value = before !== '' && Number(before) < list.length ? before : String(def);
    });
    if (kind !== 'io' && $('frontier-a').value === $('frontier-b').value) {
      $('frontier-b').value = String(Number($('frontier-a').value) === 0 ? Math.min(1, lists[1].length - 1) : 0);
    }
  }

  drawAll() {
    this.drawFrontier();
    const h = histogram(this.result);
    clear($('histogram-chart')).append(h.svg);
    if (h.skipped) $('histogram-chart').append(el('p', { class: 'chart-note' }, h.skipped + ' units without a score are not counted.'));
    const p = peerChart(this.result);
    clear($('peers-chart')).append(p.svg);
    if (p.total > p.shown) $('peers-chart').append(el('p', { class: 'chart-note' }, 'The ' + p.shown + ' units named most often are shown, of ' + p.total + ' named at least once.'));
  }

  select(k) {
    this.selected = k;
    this.drawFrontier();
  }

  drawFrontier() {
    if (!this.result) return;
    const kind = $('frontier-kind').value;
    const a = Number($('frontier-a').value), b = Number($('frontier-b').value), c = Number($('frontier-c').value);
    const { inputs, outputs } = this.choices;
    let names;
    if (kind === 'io') names = { x: inputs[a], y: outputs[b] };
    else if (kind === 'ii') names = { x: inputs[a] + ' per ' + outputs[c], y: inputs[b] + ' per ' + outputs[c] };
    else names = { x: outputs[a] + ' per ' + inputs[c], y: outputs[b] + ' per ' + inputs[c] };
    const model = this.result.model || {};
    const out = frontierChart(this.result, { kind, a, b, c, names, model, selected: this.selected });
    const holder = clear($('frontier-chart'));
    holder.append(out.svg);
    const total = inputs.length + outputs.length;
    const onScreen = kind === 'io' ? 2 : 3;
    const notes = [];
    if (total > onScreen) {
      notes.push('The line drawn is the frontier of these ' + (onScreen === 2 ? 'two' : 'three') + ' measures alone, while the scores use all ' + total + ' measures: a unit can sit inside this line and still be efficient.');
    }
    if (kind !== 'io' && model.returns !== 'constant') {
      notes.push('Ratio charts treat size as if it did not matter (constant returns), while the scores use the chosen returns to scale.');
    }
    if (this.selected >= 0) notes.push('The dashed arrow shows the chosen unit moving to its target (computed with all measures).');
    if (out.missing) notes.push(out.missing + ' units cannot be placed on this chart (a value is missing or zero where it divides).');
    $('frontier-note').textContent = notes.join(' ');
  }
}
