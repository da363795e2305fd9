// The page's handle on the Peerlens engine. The engine (Go compiled to
// WebAssembly) runs in Web Workers (site/worker.js, whose header documents
// the message protocol); this module turns messages into promises.
//
//   const eng = await Engine.start();
//   const {table, study, problems} = await eng.parse(text);
//   const parsed = await eng.parseFile(file);          // CSV/TSV/text, or .xlsx
//   const study = await eng.demo();
//   const issues = await eng.validate(study);
//   const {promise, cancel} = eng.run(study, {onProgress(done, total, phase) {}});
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
// A large run is shared by a pool of runners (up to one per processor,
// navigator.hardwareConcurrency, at most MAX_RUNNERS), in two phases:
//   'frontier': the search for the candidate set of frontier units is cut
//     by the engine into independent parts (frontierParts); each runner
//     takes the next part not yet taken until none is left (parts take
//     uneven time), then, if there were several, the sorted union of their
//     candidates is checked once more in one consecutive piece per runner
//     (frontierCheck); the pieces' answers, joined, are the candidate set.
//   'units': runner w of k evaluates every k-th chunk of units from chunk w
//     against that set (run with frontier, part w and parts k).
// How the engine cuts parts and chunks depends on the data alone, so the
// shares put back together here (units in order, peer counts recounted
// over all of them: bookkeeping only, every number comes from the engine)
// are identical, bit for bit, to one runner's whole run. Progress reports
// the phase as a third argument (in the 'frontier' phase, done counts the
// units of the parts searched). Cancelling terminates every runner of the
// pool; a failure on one runner stops the others.

// POOL_FROM is the number of included units from which a run is shared;
// below it one runner is quicker than starting several.
const POOL_FROM = 2000;

// SPARE_UP_TO is the largest study after whose shared run a runner is kept
// as the spare for the next run (see runShared).
const SPARE_UP_TO = 20000;
const MAX_RUNNERS = 8;

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
    // folder; the spreadsheet module comes as bytes too (offline.sheets) and
    // is handed to the worker when a workbook is first opened or written.
    return { workerURL: offline.workerURL, wasm: offline.wasm, sheets: offline.sheets || null, base: '' };
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
    if (/\.(xlsx|xlsm)$/i.test(name) || isZip(buf)) {
      await this.giveSheets(c);
      return c.call('parseXLSX', [buf, sheet], { transfer: [buf] });
    }
    return c.call('parseBytes', [buf], { transfer: [buf] });
  }

  // giveSheets hands the single-file build's spreadsheet module to a
  // worker (compiled once); served pages let the worker fetch it itself.
  async giveSheets(c) {
    if (!this.cfg.sheets || c.sheetsGiven) return;
    if (!this.cfg.sheetsModule) {
      this.cfg.sheetsModule = Promise.resolve(this.cfg.sheets).then((bytes) => WebAssembly.compile(bytes));
    }
    await c.call('useSheets', [await this.cfg.sheetsModule]);
    c.sheetsGiven = true;
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
    await this.giveSheets(await this.mainReady());
    const buf = await this.request('exportXLSX', study, result, new Date().toISOString());
    return new Blob([buf], { type: XLSX_TYPE });
  }

  // run compares the units of study on runner workers. It returns at once
  // with {promise, cancel}; onProgress(done, total, phase) reports units
  // done (phase 'units'), or, in a shared run, the units whose part of the
  // frontier search is done (phase 'frontier', first).
  run(study, { onProgress, units } = {}) {
    const k = runnerCount();
    if (units || k < 2 || includedCount(study) < POOL_FROM) return this.runOne(study, { onProgress, units });
    return this.runShared(study, k, onProgress);
  }

  // takeRunner returns the warmed-up spare runner, or a new one.
  takeRunner() {
    const runner = this.spare && !this.spare.dead ? this.spare : new Client(this.cfg);
    this.spare = null;
    return runner;
  }

  // keepOrStop keeps a runner that finished as the spare for the next run.
  keepOrStop(runner) {
    if (runner.dead) return;
    if (!this.spare) this.spare = runner;
    else runner.terminate(new EngineError('The runner was stopped.'));
  }

  runOne(study, { onProgress, units }) {
    const runner = this.takeRunner();
    let cancelled = false;
    const progress = onProgress && ((done, total) => onProgress(done, total, 'units'));
    const promise = runner.ready
      .then((c) => c.call('run', units ? [study, units] : [study], { onProgress: progress }))
      .finally(() => {
        if (!cancelled) this.keepOrStop(runner);
      });
    const cancel = () => {
      if (cancelled) return;
      cancelled = true;
      runner.terminate(new Cancelled());
      if (!this.spare) this.spare = new Client(this.cfg);
    };
    return { promise, cancel };
  }

  // runShared spreads one run over k runners (see the top of this file).
  runShared(study, k, onProgress) {
    const runners = [this.takeRunner()];
    for (let w = 1; w < k; w++) runners.push(new Client(this.cfg));
    let cancelled = false;
    const stopAll = (err) => runners.forEach((r) => r.terminate(err));
    const tell = (done, total, phase) => {
      if (!onProgress) return;
      try {
        onProgress(done, total, phase);
      } catch (err) {
        console.error(err);
      }
    };
    // One JSON text for every request: cloning a string to a worker is
    // cheap, and each runner's engine reads the study once and keeps it
    // for its later requests (they carry the very same text).
    const text = JSON.stringify(study);
    const ready = runners.map((r) => r.ready);
    // each runs task(client, i) for i = 0..count-1 on all runners, each
    // runner taking the next i as soon as it is free; resolves to the
    // answers in order of i.
    const each = (count, task) => {
      let next = 0;
      const out = new Array(count);
      return Promise.all(ready.map((r) => r.then(async (c) => {
        while (next < count) {
          const i = next++;
          out[i] = await task(c, i);
        }
      }))).then(() => out);
    };
    const work = async () => {
      tell(0, includedCount(study), 'frontier');
      // Every runner is asked, so that all read the study at the same time
      // (for a large study reading it is a good part of the work) rather
      // than each when it takes its first part.
      const [info] = await Promise.all(ready.map((r) => r.then((c) => c.call('frontierParts', [text]))));
      const total = info.units;
      let searched = 0;
      const found = await each(info.parts, async (c, p) => {
        const { candidates } = await c.call('frontierPart', [text, p]);
        searched += info.sizes[p];
        tell(searched, total, 'frontier');
        return candidates;
      });
      const pool = found.flat().sort((a, b) => a - b);
      let frontier = pool; // one part: its candidates are the set
      if (info.parts > 1) {
        const pieces = Math.min(k, pool.length);
        const cut = (i) => Math.floor((i * pool.length) / pieces);
        const kept = await each(pieces, (c, i) => c.call('frontierCheck', [text, pool, cut(i), cut(i + 1)]));
        frontier = kept.flatMap((r) => r.kept); // in pool order: sorted
      }
      const done = runners.map(() => 0);
      tell(0, total, 'units');
      // Each share comes back as JSON bytes (runJSON): handing over a
      // buffer and parsing it here is several times quicker than cloning
      // tens of thousands of result objects from the worker.
      const decoder = new TextDecoder();
      const parts = await Promise.all(ready.map((r, w) => r.then((c) =>
        c.call('runJSON', [text, null, frontier, w, k], {
          onProgress(d) {
            done[w] = d;
            tell(done.reduce((a, b) => a + b, 0), total, 'units');
          },
        })).then((buf) => JSON.parse(decoder.decode(buf)))));
      return mergeShares(parts, frontier);
    };
    const promise = work().then(
      (result) => {
        // A runner's WebAssembly memory keeps the size the run grew it to,
        // so after a very large study none is kept: the next run starts a
        // fresh one.
        const keep = includedCount(study) <= SPARE_UP_TO ? 1 : 0;
        if (keep) this.keepOrStop(runners[0]);
        runners.slice(keep).forEach((r) => r.terminate(new EngineError('The runner was stopped.')));
        return result;
      },
      (err) => {
        if (!cancelled) stopAll(new EngineError('The runner was stopped.')); // one share failed: stop the others
        throw err;
      });
    const cancel = () => {
      if (cancelled) return;
      cancelled = true;
      stopAll(new Cancelled());
      if (!this.spare || this.spare.dead) this.spare = new Client(this.cfg);
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

// runnerCount is how many runners share a large run.
function runnerCount() {
  const n = (typeof navigator !== 'undefined' && navigator.hardwareConcurrency) || 2;
  return Math.max(1, Math.min(n, MAX_RUNNERS));
}

// includedCount is the number of units of a study (its file form) that
// take part in a run: all but the ones left out.
function includedCount(study) {
  if (!study || typeof study !== 'object' || !Array.isArray(study.units)) return 0;
  const out = new Set(Array.isArray(study.leftOut) ? study.leftOut : []);
  return out.size ? study.units.filter((u) => !out.has(u)).length : study.units.length;
}

// mergeShares puts the results of runs over disjoint shares of the units
// back together as one result, as the engine's own dea.Merge does: units
// in order of their index, and each unit's peer count (how many other
// units name it as a peer) recounted over all units.
function mergeShares(parts, frontier) {
  const units = [];
  for (const p of parts) for (const u of p.units) units.push(u);
  units.sort((a, b) => a.index - b.index);
  const at = new Map();
  units.forEach((u, k) => {
    u.peerCount = 0;
    at.set(u.index, k);
  });
  for (const u of units) {
    for (const p of u.peers || []) {
      const k = p.index === u.index ? undefined : at.get(p.index);
      if (k !== undefined) units[k].peerCount++;
    }
  }
  return { ...parts[0], units, frontier };
}

// isZip reports whether a file starts like a zip archive (an .xlsx file
// under another name).
function isZip(buf) {
  const b = new Uint8Array(buf, 0, Math.min(4, buf.byteLength));
  return b.length === 4 && b[0] === 0x50 && b[1] === 0x4b && b[2] === 0x03 && b[3] === 0x04;
}

export default Engine;
