// The model choice: returns to scale, orientation and the extra details,
// read from and written to the study's settings.

import { $ } from './dom.js';

const DEFAULTS = { returns: 'variable', orientation: 'input', secondStage: true, super: false, scaleDetail: true };

export class ModelForm {
  constructor(onChange) {
    this.form = $('model-form');
    this.form.addEventListener('change', () => {
      this.syncBounds();
      onChange(this.read());
    });
    this.form.addEventListener('submit', (e) => e.preventDefault());
  }

  // show puts a study's settings into the form.
  show(settings) {
    const s = { ...DEFAULTS, ...(settings || {}) };
    for (const r of this.form.elements.returns) r.checked = r.value === s.returns;
    for (const r of this.form.elements.orientation) r.checked = r.value === s.orientation;
    $('opt-second').checked = !!s.secondStage;
    $('opt-super').checked = !!s.super;
    $('opt-scale').checked = !!s.scaleDetail;
    if (s.returns === 'bounded') {
      $('bound-lower').value = s.lower ?? 0;
      $('bound-upper').value = s.upper ? s.upper : '';
    }
    this.syncBounds();
  }

  syncBounds() {
    const bounded = $('rts-bounded').checked;
    $('bound-lower').disabled = !bounded;
    $('bound-upper').disabled = !bounded;
  }

  // read returns the settings as the study holds them.
  read() {
    const f = this.form.elements;
    const m = {
      returns: f.returns.value || DEFAULTS.returns,
      orientation: f.orientation.value || DEFAULTS.orientation,
      secondStage: $('opt-second').checked,
      super: $('opt-super').checked,
      scaleDetail: $('opt-scale').checked,
    };
    if (m.returns === 'bounded') {
      const lo = parseFloat($('bound-lower').value);
      const hi = parseFloat($('bound-upper').value);
      m.lower = Number.isFinite(lo) ? lo : 0;
      m.upper = Number.isFinite(hi) ? hi : 0;
    }
    return m;
  }
}

// describeModel says in one line which model produced a result.
export function describeModel(m) {
  if (!m) return '';
  const rts = {
    constant: 'constant returns (CCR)',
    variable: 'variable returns (BCC)',
    'non-increasing': 'non-increasing returns',
    'non-decreasing': 'non-decreasing returns',
    bounded: 'bounded returns (peer weights between ' + (m.lower ?? 0) + ' and ' + (m.upper ? m.upper : 'no limit') + ')',
  }[m.returns] || m.returns;
  const or = m.orientation === 'output' ? 'grow outputs (output orientation)' : 'save inputs (input orientation)';
  const extras = [];
  if (m.secondStage) extras.push('remaining slack');
  if (m.super) extras.push('super-efficiency');
  if (m.scaleDetail) extras.push('scale detail');
  return 'Model: ' + rts + ', ' + or + (extras.length ? '; with ' + extras.join(', ') : '') + '.';
}
