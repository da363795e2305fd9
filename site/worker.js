// Peerlens engine worker: runs the Go engine (WebAssembly) off the page's
// thread. A classic worker; engine.js starts and talks to it. The engine's
// calls are synchronous inside the worker, so while a run is going this
// worker answers nothing else; a run is cancelled by terminating its worker
// (engine.js then starts a fresh one). The page's data are never here: each
// request carries copies.
//
// Message protocol (plain objects, structured clone):
//
// page -> worker, first and once:
//   {op: 'init', base, module?}
//     base:   absolute URL of the folder holding wasm_exec.js, peerlens.wasm
//             and peerlens-sheets.wasm;
//     module: the engine compiled by the page (a WebAssembly.Module, shared
//             by all workers); without it the worker fetches peerlens.wasm.
// worker -> page, once:
//   {type: 'ready', version}            the engine is loaded
//   {type: 'failed', message}           it could not be loaded; the worker is useless
//
// page -> worker, any number: {id, op, args}
//   op           args                              value of the reply
//   parse        [text]                            {table, study, problems}
//   parseBytes   [ArrayBuffer]                     {table, study, problems}  (text file, any common encoding)
//   parseXLSX    [ArrayBuffer, sheetName?]         {table, study, problems, sheets, sheet}
//   demo         []                                study
//   validate     [study]                           [issue]
//   frontier     [study]                           {frontier, units}  (candidate set, indices into the
//                                                  included units; units: how many are included)
//   frontierParts [study]                          {parts, sizes, units}  (the search for the candidate
//                                                  set cut into independent parts; sizes: units in each)
//   frontierPart [study, p]                        {candidates}  (of part p, from 0)
//   frontierCheck [study, pool, lo, hi]            {kept}  (units of pool[lo:hi] that stay candidates
//                                                  against all of pool, the sorted union of every
//                                                  part's candidates; joined over consecutive pieces:
//                                                  the candidate set)
//   run          [study, units?, frontier?,        result  (units: indices into the included units;
//                 part?, parts?]                   frontier: the candidate set; part of parts: every
//                                                  parts-th chunk of units from chunk part, so that
//                                                  the parts merged equal one whole run bit for bit)
//   runJSON      as run                            ArrayBuffer (transferred): the result's JSON text,
//                                                  UTF-8; much quicker to hand over when large
//   explain      [model, unitResult]               {unit, summary, sections}
//   describe     [model]                           {sentences, sources, cautions}
//   exportCSV    [study, result]                   string
//   exportXLSX   [study, result, dateISO]          ArrayBuffer (transferred)
//   useSheets    [WebAssembly.Module]              true (the single-file build hands over the spreadsheet module)
// worker -> page, for each request:
//   {id, type: 'progress', done, total}   run and runJSON only, now and then (units done of total)
//   {id, type: 'result', value}           success
//   {id, type: 'error', message}          failure, in plain words
//
// The studies and results are the engine's JSON forms (see wasm/main.go).
// The spreadsheet module (peerlens-sheets.wasm) is loaded only when
// parseXLSX or exportXLSX is first asked for. Several workers can run side
// by side: they find the candidate set together (frontierParts,
// frontierPart, frontierCheck), then each runs its part of the units
// against it (run with frontier, part and parts). A study may be sent as
// JSON text instead of an object; the engine keeps the last study it read,
// so a runner asked several times about the same study reads it once.
'use strict';

let base = '';
let engine = null; // globalThis.peerlensEngine once loaded
let sheetsModule = null; // promise of globalThis.peerlensSheets
let booted = null; // promise settled when the engine is loaded

// instantiate starts one Go program from its bytes or URL and resolves once
// the program has registered its global object.
async function instantiate(source, globalName) {
  if (typeof Go === 'undefined') importScripts(base + 'wasm_exec.js');
  const go = new Go();
  let result;
  if (source instanceof WebAssembly.Module) {
    result = { instance: await WebAssembly.instantiate(source, go.importObject) };
  } else if (source instanceof ArrayBuffer || ArrayBuffer.isView(source)) {
    result = await WebAssembly.instantiate(source, go.importObject);
  } else {
    const response = await fetch(source);
    if (!response.ok) throw new Error('could not load ' + source + ' (HTTP ' + response.status + ')');
    if (WebAssembly.instantiateStreaming && (response.headers.get('Content-Type') || '').startsWith('application/wasm')) {
      result = await WebAssembly.instantiateStreaming(response, go.importObject);
    } else {
      result = await WebAssembly.instantiate(await response.arrayBuffer(), go.importObject);
    }
  }
  const exited = go.run(result.instance); // resolves only if the program stops
  exited.then(() => {
    if (globalName === 'peerlensEngine') engine = null;
    else sheetsModule = null;
  });
  const obj = globalThis[globalName];
  if (!obj) throw new Error('the module did not start (' + globalName + ' missing)');
  return obj;
}

function sheets() {
  if (!sheetsModule) {
    sheetsModule = instantiate(base + 'peerlens-sheets.wasm', 'peerlensSheets').catch((err) => {
      sheetsModule = null;
      throw new Error('The spreadsheet reader could not be loaded (' + message(err) + '). Save the sheet as CSV and open that instead.');
    });
  }
  return sheetsModule;
}

function message(err) {
  return err && err.message ? err.message : String(err);
}

// check unwraps a bridge reply: {error} becomes a thrown Error.
function check(v) {
  if (v && typeof v === 'object' && !Array.isArray(v) && typeof v.error === 'string' && Object.keys(v).length === 1) {
    throw new Error(v.error);
  }
  return v;
}

const bytes = (buf) => (buf instanceof Uint8Array ? buf : new Uint8Array(buf));

// runArgs turns run's arguments after the study, and the request id, into
// the engine's: progress messages for the request, then the options.
function runArgs(units, frontier, part, parts, id) {
  const progress = (done, total) => postMessage({ id, type: 'progress', done, total });
  const opt = (v) => (v == null ? undefined : v);
  return [progress, opt(units), opt(frontier), opt(part), opt(parts)];
}

const ops = {
  parse: (text) => check(engine.parse(String(text))),
  parseBytes: (buf) => check(engine.parseBytes(bytes(buf))),
  async parseXLSX(buf, sheetName) {
    const s = await sheets();
    const read = check(s.read(bytes(buf), sheetName == null ? undefined : String(sheetName)));
    const parsed = check(engine.parseRecords(read.records));
    parsed.sheets = read.sheets;
    parsed.sheet = read.sheet;
    return parsed;
  },
  // useSheets takes the spreadsheet module from the page (the single-file
  // build has no file to fetch it from).
  async useSheets(module) {
    if (!sheetsModule) {
      sheetsModule = instantiate(module, 'peerlensSheets');
      sheetsModule.catch(() => {
        sheetsModule = null;
      });
    }
    await sheetsModule;
    return true;
  },
  demo: () => check(engine.demo()),
  validate: (study) => check(engine.validate(study)),
  frontier: (study) => check(engine.frontier(study)),
  frontierParts: (study) => check(engine.frontierParts(study)),
  frontierPart: (study, p) => check(engine.frontierPart(study, p)),
  frontierCheck: (study, pool, lo, hi) => check(engine.frontierCheck(study, pool, lo, hi)),
  run: (study, ...rest) => check(engine.run(study, ...runArgs(...rest))),
  // runJSON answers with the result's JSON text as bytes, in a buffer that
  // is handed over to the page rather than copied (see runJSON in
  // wasm/bridge.go).
  runJSON: (study, ...rest) => check(engine.runJSON(study, ...runArgs(...rest))).buffer,
  explain: (model, unit) => check(engine.explain(model, unit)),
  describe: (model) => check(engine.describe(model)),
  exportCSV: (study, result) => check(engine.exportCSV(study, result)),
  async exportXLSX(study, result, dateISO) {
    const s = await sheets();
    const arr = check(s.write(study, result, dateISO || new Date().toISOString()));
    return arr.buffer.byteLength === arr.byteLength ? arr.buffer : arr.slice().buffer;
  },
};

async function boot(msg) {
  base = msg.base || '';
  try {
    engine = await instantiate(msg.module || msg.wasm || base + 'peerlens.wasm', 'peerlensEngine');
    postMessage({ type: 'ready', version: engine.version() });
  } catch (err) {
    postMessage({ type: 'failed', message: message(err) });
    throw err;
  }
}

async function answer(msg) {
  const { id, op } = msg;
  const args = Array.isArray(msg.args) ? msg.args.slice() : [];
  try {
    await booted;
    if (!engine) throw new Error('The engine is not running; reload the page.');
    const fn = ops[op];
    if (!fn) throw new Error('unknown request ' + JSON.stringify(op));
    const running = op === 'run' || op === 'runJSON';
    if (running) args.length = 5; // study, units, frontier, part, parts; then the request id
    const value = await fn(...(running ? [...args, id] : args));
    const transfer = value instanceof ArrayBuffer ? [value] : [];
    postMessage({ id, type: 'result', value }, transfer);
  } catch (err) {
    postMessage({ id, type: 'error', message: message(err) });
  }
}

self.onmessage = (e) => {
  const msg = e.data || {};
  if (msg.op === 'init') {
    if (!booted) booted = boot(msg).catch(() => {});
    return;
  }
  if (!booted) {
    postMessage({ id: msg.id, type: 'error', message: 'The engine was asked before it was started.' });
    return;
  }
  answer(msg);
};
