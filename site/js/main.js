// Peerlens page: wires the views to the engine. The engine (a WebAssembly
// module behind site/engine.js) does every calculation; this file only moves
// data between it and the views.

import * as bridge from '../engine.js';
import { $, el, clear, debounce, download } from './dom.js';
import { StudyView } from './studyview.js';
import { Preview } from './preview.js';
import { ModelForm, describeModel } from './modelform.js';
import { ResultsTable } from './results.js';
import { UnitReport } from './unitreport.js';
import { ChartsPanel } from './chartspanel.js';
import { Keeper } from './share.js';
import { PrintReport } from './printreport.js';

const state = {
  eng: null,
  view: null, // StudyView of the study being edited
  run: null, // the run in progress: {cancel}
  result: null, // the last finished result
  resultStudy: null, // the study (a copy) that result was computed from
  selected: -1,
  stale: false,
  validateSerial: 0,
  loads: 0, // studies loaded so far
  validations: 0, // checks finished so far
  runs: 0, // runs finished so far (with results shown)
};

const preview = new Preview(() => studyChanged());
const modelForm = new ModelForm((settings) => {
  if (!state.view) return;
  state.view.study.settings = settings;
  studyChanged();
});
const results = new ResultsTable((k) => selectUnit(k));
const unitReport = new UnitReport();
const charts = new ChartsPanel((k) => selectUnit(k, true));
// Study files, share links, the opt-in copy in this browser (share.js).
const keeper = new Keeper({
  engine: () => state.eng,
  study: () => (state.view ? state.view.study : null),
  load: (study, note) => loadStudy(study, null, [], note),
  run: () => runStudy(),
});
const printReport = new PrintReport(() => state.eng);

function say(id, text, kind) {
  const n = $(id);
  n.textContent = text;
  n.className = n.className.replace(/\b(ok|bad|busy)\b/g, '').trim() + (kind ? ' ' + kind : '');
}

function message(err) {
  if (!err) return 'unknown problem';
  if (typeof err === 'string') return err;
  return err.message || String(err);
}

// copyStudy makes an independent copy, so a run and its exports keep the
// study exactly as it was when the run started.
const copyStudy = (s) => JSON.parse(JSON.stringify(s));

async function start() {
  const Engine = bridge.Engine || bridge.default;
  try {
    state.eng = await Engine.start();
  } catch (err) {
    say('engine-status', 'The engine could not start: ' + message(err) + '. Reload the page to try again.', 'bad');
    return;
  }
  say('engine-status', 'Engine ready. Everything runs in this tab.', 'ok');
  document.body.classList.add('engine-ready');
  if (await keeper.restore()) return;
  try {
    const demo = await state.eng.demo();
    await loadStudy(demo, null, [], 'Loaded the demo study' + (demo.title ? ': ' + demo.title : '') + '.');
  } catch (err) {
    say('intake-status', 'The demo study could not be loaded: ' + message(err), 'bad');
  }
}

async function loadStudy(study, table, problems, note) {
  cancelRun(true);
  state.view = new StudyView(study, table, problems);
  preview.show(state.view);
  modelForm.show(study.settings);
  clearResults();
  const n = (study.units || []).length, m = (study.measures || []).length;
  say('intake-status', note + ' ' + n + (n === 1 ? ' unit' : ' units') + ' and ' + m + (m === 1 ? ' measure.' : ' measures.'), 'ok');
  keeper.loaded(study, !!table);
  await revalidate();
  state.loads++;
}

async function readText(text) {
  if (!text.trim()) {
    say('intake-status', 'There is nothing to read: paste a table into the box first.', 'bad');
    $('paste').focus();
    return;
  }
  say('intake-status', 'Reading the table…', 'busy');
  try {
    const r = await state.eng.parse(text);
    await took(r, 'Read the pasted table.');
  } catch (err) {
    say('intake-status', 'The table could not be read: ' + message(err), 'bad');
  }
}

async function readFile(file) {
  if (!file) return;
  say('intake-status', 'Reading ' + file.name + '…', 'busy');
  try {
    const r = await state.eng.parseFile(file);
    await took(r, 'Read ' + file.name + '.');
  } catch (err) {
    say('intake-status', file.name + ' could not be read: ' + message(err), 'bad');
  }
}

async function took(r, note) {
  if (!r || !r.study) {
    const ps = (r && r.problems) || [];
    say('intake-status', 'No study could be made from this table' + (ps.length ? ': ' + ps.map((p) => p.message || p.Message || p.reason || '').filter(Boolean).join('; ') : '.'), 'bad');
    return;
  }
  await loadStudy(r.study, r.table, r.problems, note);
}

// studyChanged runs after any edit: results become stale, the study is
// checked again.
const revalidateSoon = debounce(() => revalidate(), 150);
function studyChanged() {
  if (state.result && !state.stale) {
    state.stale = true;
    $('results').classList.add('stale');
    say('run-status', 'The table or the model changed after these results were computed: compare the units again to update them.', 'busy');
  }
  keeper.changed();
  revalidateSoon();
}

async function revalidate() {
  const v = state.view;
  if (!v) return;
  const serial = ++state.validateSerial;
  let issues = [];
  try {
    issues = await state.eng.validate(v.study);
  } catch (err) {
    issues = [{ severity: 'error', code: 'engine', message: 'The study could not be checked: ' + message(err), units: [], measures: [] }];
  }
  if (serial !== state.validateSerial || v !== state.view) return;
  v.setIssues(issues);
  preview.refresh();
  showStudyIssues(v);
  state.validations++;
}

function showStudyIssues(v) {
  const list = clear($('study-issues'));
  const errors = v.messages.filter((m) => m.from === 'study' && m.severity === 'error');
  for (const m of errors.slice(0, 5)) list.append(el('li', { class: 'issue error' }, [el('span', { class: 'badge error' }, 'error'), ' ', m.message]));
  if (errors.length > 5) list.append(el('li', { class: 'issue error' }, 'and ' + (errors.length - 5) + ' more — see the messages beside the table.'));
  $('run').setAttribute('aria-describedby', errors.length ? 'study-issues' : 'run-status');
}

async function runStudy() {
  const v = state.view;
  if (!v || state.run) return;
  await revalidate();
  if (v.hasErrors()) {
    say('run-status', 'The study cannot be compared yet: fix the problems marked in the table (listed beside it) first.', 'bad');
    $('issues').querySelector('button, li')?.scrollIntoView({ block: 'nearest' });
    return;
  }
  const snapshot = copyStudy(v.study);
  if (state.result) {
    // The earlier results stay readable but are marked as out of date.
    state.stale = true;
    $('results').classList.add('stale');
  }
  const bar = $('progress');
  bar.value = 0;
  bar.max = 1;
  $('progress-wrap').hidden = false;
  $('cancel').hidden = false;
  $('run').disabled = true;
  document.body.classList.add('running');
  say('run-status', 'Comparing the units…', 'busy');
  let handle;
  try {
    handle = startRun(snapshot, {
      onProgress(done, total, phase) {
        if (state.run !== handle) return;
        bar.max = Math.max(1, total);
        bar.value = done;
        if (phase === 'frontier') {
          say('run-status', 'Finding the units on the frontier first (' + total + ' units)…', 'busy');
          return;
        }
        say('run-status', 'Comparing the units: ' + done + ' of ' + total + ' done. Results appear when all are done.', 'busy');
      },
    });
  } catch (err) {
    finishRun();
    say('run-status', 'The comparison could not start: ' + message(err), 'bad');
    return;
  }
  state.run = handle;
  let result;
  try {
    result = await handle.promise;
  } catch (err) {
    if (state.run !== handle) return; // cancelled: already reported
    finishRun();
    say('run-status', 'The comparison stopped: ' + message(err), 'bad');
    return;
  }
  if (state.run !== handle) return;
  finishRun();
  showResults(snapshot, result);
}

// startRun asks the engine for a run and returns {promise, cancel}.
function startRun(study, opts) {
  const h = state.eng.run(study, opts);
  if (h && h.promise) return h;
  return { promise: Promise.resolve(h), cancel() {} }; // an engine without cancel
}

function finishRun() {
  state.run = null;
  $('progress-wrap').hidden = true;
  $('cancel').hidden = true;
  $('run').disabled = false;
  document.body.classList.remove('running');
}

function cancelRun(quiet) {
  const h = state.run;
  if (!h) return;
  state.run = null;
  try { h.cancel(); } catch { /* the run may have just finished */ }
  finishRun();
  if (!quiet) say('run-status', 'Cancelled. Nothing was changed; the table and the model are as they were.', '');
  $('run').focus();
}

function clearResults() {
  state.result = null;
  state.resultStudy = null;
  state.selected = -1;
  state.stale = false;
  $('results').classList.remove('stale');
  $('results-body').hidden = true;
  $('results-empty').hidden = false;
  $('charts-body').hidden = true;
  $('charts-empty').hidden = false;
  unitReport.clear();
  say('run-status', '', '');
}

function showResults(study, result) {
  state.result = result;
  state.resultStudy = study;
  state.selected = -1;
  state.stale = false;
  $('results').classList.remove('stale');
  $('results-empty').hidden = true;
  $('results-body').hidden = false;
  $('charts-empty').hidden = true;
  $('charts-body').hidden = false;
  $('results-model').textContent = describeModel(result.model || study.settings);
  results.show(result);
  unitReport.clear();
  charts.show(result, study);
  printReport.show(study, result);
  const n = result.units.length;
  const eff = result.units.filter((u) => u.status === 'efficient').length;
  const unverified = result.units.filter((u) => !(u.certificate && u.certificate.verified)).length;
  say('run-status', 'Done: ' + n + ' units compared, ' + eff + ' efficient.' + (unverified ? ' ' + unverified + ' results could not be verified; they are marked.' : ' Every result was verified.'), 'ok');
  document.body.classList.add('has-results');
  state.runs++;
}

async function selectUnit(k, fromChart) {
  if (!state.result) return;
  state.selected = k;
  if (fromChart) results.select(k);
  charts.select(k);
  const u = state.result.units[k];
  let rep = null;
  try {
    rep = await state.eng.explain(state.resultStudy, state.result, k);
  } catch (err) {
    rep = { error: message(err) };
  }
  if (state.selected !== k) return;
  unitReport.show(u, rep, state.result.model);
  if (fromChart) $('unit-report').focus({ preventScroll: true });
}

async function exportAs(kind) {
  if (!state.result) return;
  try {
    if (kind === 'csv') {
      const text = await state.eng.exportCSV(state.resultStudy, state.result);
      download(new Blob([text], { type: 'text/csv;charset=utf-8' }), 'peerlens-results.csv');
    } else {
      const data = await state.eng.exportXLSX(state.resultStudy, state.result);
      const type = 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet';
      download(data instanceof Blob ? data : new Blob([data], { type }), 'peerlens-results.xlsx');
    }
  } catch (err) {
    say('run-status', 'The export failed: ' + message(err), 'bad');
  }
}

function wire() {
  $('read-paste').addEventListener('click', () => readText($('paste').value));
  $('file-input').addEventListener('change', (e) => {
    readFile(e.target.files[0]);
    e.target.value = '';
  });
  $('load-demo').addEventListener('click', async () => {
    try {
      const demo = await state.eng.demo();
      await loadStudy(demo, null, [], 'Loaded the demo study' + (demo.title ? ': ' + demo.title : '') + '.');
    } catch (err) {
      say('intake-status', 'The demo study could not be loaded: ' + message(err), 'bad');
    }
  });
  const dz = $('dropzone');
  dz.addEventListener('dragover', (e) => {
    e.preventDefault();
    dz.classList.add('dragging');
  });
  dz.addEventListener('dragleave', (e) => {
    if (!dz.contains(e.relatedTarget)) dz.classList.remove('dragging');
  });
  dz.addEventListener('drop', (e) => {
    e.preventDefault();
    dz.classList.remove('dragging');
    const f = e.dataTransfer && e.dataTransfer.files && e.dataTransfer.files[0];
    if (f) readFile(f);
    else if (e.dataTransfer) {
      const text = e.dataTransfer.getData('text/plain');
      if (text) {
        $('paste').value = text;
        readText(text);
      }
    }
  });
  // Dropping a file anywhere else must not navigate away from the page.
  window.addEventListener('dragover', (e) => e.preventDefault());
  window.addEventListener('drop', (e) => e.preventDefault());
  $('run').addEventListener('click', runStudy);
  $('cancel').addEventListener('click', () => cancelRun(false));
  document.addEventListener('keydown', (e) => {
    if (e.key === 'Escape' && state.run) cancelRun(false);
  });
  $('export-csv').addEventListener('click', () => exportAs('csv'));
  $('export-xlsx').addEventListener('click', () => exportAs('xlsx'));
}

wire();
start();

// For the browser tests and for curious analysts: read-only access to the
// current state (no way in for page content).
Object.defineProperty(window, 'peerlens', {
  value: Object.freeze({
    get result() { return state.result; },
    get study() { return state.view ? state.view.study : null; },
    get running() { return !!state.run; },
    get loads() { return state.loads; },
    get validations() { return state.validations; },
    get runs() { return state.runs; },
    get selected() { return state.selected; },
  }),
});
