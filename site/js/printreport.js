// The printed report's opening: what was compared, with which settings, and
// the method in plain words with its sources. It is filled in after every
// run and shown only on paper (see share.css); the results, cautions and
// charts below it print as they are on screen.

import { $, el, clear } from './dom.js';

export class PrintReport {
  // engine() gives the engine, for the method description.
  constructor(engine) {
    this.engine = engine;
    this.serial = 0;
  }

  async show(study, result) {
    const serial = ++this.serial;
    const units = study.units || [];
    const left = study.leftOut || [];
    const roles = (study.measures || []).filter((m) => m.role === 'input' || m.role === 'output');
    const list = clear($('print-settings'));
    const item = (label, text) => list.append(el('li', null, [el('strong', null, label + ': '), text]));
    if (study.title) item('Study', study.title);
    item('Printed', new Date().toLocaleString('en-GB'));
    item('Units compared', String(units.length - left.length) + ' of ' + units.length);
    if (left.length) item('Left out', left.join(', '));
    item('Inputs', roles.filter((m) => m.role === 'input').map((m) => m.name).join(', ') || 'none');
    item('Outputs', roles.filter((m) => m.role === 'output').map((m) => m.name).join(', ') || 'none');
    item('Model', $('results-model').textContent);
    const method = clear($('print-method'));
    const eng = this.engine();
    if (!eng || typeof eng.describe !== 'function') return;
    let d;
    try {
      d = await eng.describe(result.model || study.settings);
    } catch (err) {
      method.append(el('p', null, 'The method description is not available: ' + (err && err.message ? err.message : String(err))));
      return;
    }
    if (serial !== this.serial || !d) return;
    for (const s of d.sentences || []) method.append(el('p', null, s));
    const sources = d.sources || [];
    if (sources.length) {
      method.append(el('h4', null, 'Sources'));
      method.append(el('ul', null, sources.map((s) => el('li', null, typeof s === 'string' ? s : (s.text || s.citation || JSON.stringify(s))))));
    }
  }
}
