// The page's handle on the Peerlens engine. The engine (Go compiled to
// WebAssembly) runs in Web Workers (site/worker.js, whose header documents
// the message protocol); this module turns messages into promises.
//
//   const eng = await Engine.start();
//   const {table, study, problems} = await eng.parse(text);
//   const parsed = await eng.parseFile(file);          // CSV/TSV/text, or .xlsx
//   const study = await eng.demo();
//   const issues = await eng.validate(study);
//   const {promise, cancel} = eng.run(study, {onProgress(done, total) {}});
//   const result = await promise;                      // rejects with Cancelled after cancel()
//   const report = await eng.explain(study, result, k); // k: index into result.units
//   const text = await eng.exportCSV(study, result);
//   const blob = await eng.exportXLSX(study, result);
//
// Two kinds of worker: one answers the page's quick requests (reading,
// checking, explaining, exporting); runs go to a separate runner worker, so
// the page stays responsive during a long run, and cancelling a run
// terminates only its runner (a synchronous engine cannot be interrupted
// any other way) and starts a fresh one. Every request sends a copy of the
// page's data, so a cancelled run leaves the page's study untouched.
//
// A run may later be split over several runners (one per
// navigator.hardwareConcurrency) with the worker's `units` argument; the
// runner pool below is where that belongs.

const XLSX_TYPE = 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet';

// Cancelled is the rejection of a run's promise after its cancel().
export class Cancelled extends Error {
  constructor(msg = 'The run was cancelled.') {
    super(msg);
    this.name = 'Cancelled';
  }
}

// EngineError is a failure reported by the engine, in plain words.
export class EngineError extends Error {
  constructor(msg) {
    super(msg);
    this.name = 'EngineError';
  }
}

// Where the worker, wasm_exec.js and the modules live: beside this file,
// unless the single-file build supplies the worker and the engine's bytes.
function setup() {
  const offline = globalThis.peerlensOffline;
  if (offline && offline.workerURL) {
    // The single-file build: this module is a blob: URL, which has no
    // folder; the spreadsheet module is not part of that file.
    return { workerURL: offline.workerURL, wasm: offline.wasm, base: '' };
  }
  const base = new URL('./', import.meta.url).href;
  return { workerURL: new URL('./worker.js', base).href, wasm: null, base };
}

// Client is one worker and its pending requests.
class Client {
  constructor(cfg) {
    this.pending = new Map();
    this.nextId = 1;
    this.dead = null;
    this.worker = new Worker(cfg.workerURL);
    this.ready = new Promise((resolve, reject) => {
      this.rejectReady = reject;
      this.worker.onmessage = (e) => {
        const m = e.data || {};
        if (m.type === 'ready') {
          this.version = m.version;
          resolve(this);
        } else if (m.type === 'failed') {
          reject(new EngineError('The engine could not be loaded: ' + m.message));
          this.terminate(new EngineError('The engine could not be loaded: ' + m.message));
        } else {
          this.receive(m);
        }
      };
      this.worker.onerror = (e) => {
        const err = new EngineError('The engine stopped: ' + (e.message || 'the worker failed'));
        reject(err);
        this.terminate(err);
      };
    });
    this.ready.catch(() => {}); // reported to whoever awaits it
    Promise.resolve(cfg.module)
      .then((module) => this.worker.postMessage({ op: 'init', base: cfg.base, module }))
      .catch((err) => this.terminate(new EngineError('The engine could not be loaded: ' + (err && err.message))));
  }

  receive(m) {
    const p = this.pending.get(m.id);
    if (!p) return;
    if (m.type === 'progress') {
      if (p.onProgress) {
        try {
          p.onProgress(m.done, m.total);
        } catch (err) {
          console.error(err);
        }
      }
      return;
    }
    this.pending.delete(m.id);
    if (m.type === 'result') p.resolve(m.value);
    else p.reject(new EngineError(m.message || 'The engine failed.'));
  }

  call(op, args, { onProgress, transfer } = {}) {
    if (this.dead) return Promise.reject(this.dead);
    const id = this.nextId++;
    return new Promise((resolve, reject) => {
      this.pending.set(id, { resolve, reject, onProgress });
      this.worker.postMessage({ id, op, args }, transfer || []);
    });
  }

  // terminate stops the worker; every pending request rejects with err.
  terminate(err) {
    if (this.dead) return;
    this.dead = err;
    this.worker.terminate();
    this.rejectReady(err); // no effect once ready
    for (const p of this.pending.values()) p.reject(err);
    this.pending.clear();
  }
}

export class Engine {
  constructor(cfg) {
    this.cfg = cfg;
    this.main = new Client(cfg);
    this.spare = null; // a runner started ahead of the next run
  }

  // start loads the engine and resolves when it is ready.
  static async start(options = {}) {
    const cfg = { ...setup(), ...options };
    // Fetch and compile the engine once; every worker instantiates the
    // same compiled module (modules can be posted to workers).
    cfg.module = cfg.wasm
      ? Promise.resolve(cfg.wasm).then((bytes) => WebAssembly.compile(bytes))
      : WebAssembly.compileStreaming(fetch(cfg.base + 'peerlens.wasm')).catch(() =>
          fetch(cfg.base + 'peerlens.wasm').then((r) => r.arrayBuffer()).then((b) => WebAssembly.compile(b)));
    cfg.module.catch(() => {}); // reported through the worker's start
    const eng = new Engine(cfg);
    await eng.main.ready;
    eng.version = eng.main.version;
    eng.spare = new Client(eng.cfg); // warm up a runner in the background
    return eng;
  }

  request(op, ...args) {
    return this.mainReady().then((c) => c.call(op, args));
  }

  parse(text) {
    return this.request('parse', String(text));
  }

  // parseFile reads a File or Blob: .xlsx workbooks through the spreadsheet
  // module, anything else as text (its encoding worked out by the engine).
  async parseFile(file, { sheet } = {}) {
    const name = (file && file.name) || '';
    if (/\.(xls|ods|numbers)$/i.test(name)) {
      throw new EngineError(name + ' is in a spreadsheet format Peerlens cannot read; save it as .xlsx or CSV and open that.');
    }
    const buf = await file.arrayBuffer();
    const c = await this.mainReady();
    if (/\.(xlsx|xlsm)$/i.test(name) || isZip(buf)) return c.call('parseXLSX', [buf, sheet], { transfer: [buf] });
    return c.call('parseBytes', [buf], { transfer: [buf] });
  }

  mainReady() {
    if (this.main.dead) this.main = new Client(this.cfg);
    return this.main.ready;
  }

  demo() {
    return this.request('demo');
  }

  validate(study) {
    return this.request('validate', study);
  }

  describe(model) {
    return this.request('describe', model);
  }

  // explain sends only the model and the one unit's result.
  explain(study, result, k) {
    const u = result && result.units && result.units[k];
    if (!u) return Promise.reject(new EngineError('There is no unit ' + k + ' in these results.'));
    return this.request('explain', result.model || (study && study.settings), u);
  }

  exportCSV(study, result) {
    return this.request('exportCSV', study, result);
  }

  async exportXLSX(study, result) {
    const buf = await this.request('exportXLSX', study, result, new Date().toISOString());
    return new Blob([buf], { type: XLSX_TYPE });
  }

  // run compares the units of study on a runner worker. It returns at once
  // with {promise, cancel}; onProgress(done, total) reports units done.
  run(study, { onProgress, units } = {}) {
    const runner = this.spare && !this.spare.dead ? this.spare : new Client(this.cfg);
    this.spare = null;
    let cancelled = false;
    const promise = runner.ready
      .then((c) => c.call('run', units ? [study, units] : [study], { onProgress }))
      .finally(() => {
        if (cancelled || runner.dead) return;
        if (!this.spare) this.spare = runner; // reuse it for the next run
        else runner.terminate(new EngineError('The runner was stopped.'));
      });
    const cancel = () => {
      if (cancelled) return;
      cancelled = true;
      runner.terminate(new Cancelled());
      if (!this.spare) this.spare = new Client(this.cfg);
    };
    return { promise, cancel };
  }

  // close stops every worker.
  close() {
    const err = new EngineError('The engine was closed.');
    this.main.terminate(err);
    if (this.spare) this.spare.terminate(err);
  }
}

// isZip reports whether a file starts like a zip archive (an .xlsx file
// under another name).
function isZip(buf) {
  const b = new Uint8Array(buf, 0, Math.min(4, buf.byteLength));
  return b.length === 4 && b[0] === 0x50 && b[1] === 0x4b && b[2] === 0x03 && b[3] === 0x04;
}

export default Engine;
