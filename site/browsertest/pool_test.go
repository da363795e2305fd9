package browsertest

import (
	"bytes"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"peerlens/engine/bench"
	"peerlens/engine/dea"
	"peerlens/site/sitecopy"
)

// pooledUnits is large enough for engine.js to share the run among workers
// (it does so from 2,000 included units).
const pooledUnits = 3000

// pooledUnit is what the comparison needs of one unit's result.
type pooledUnit struct {
	Index     int    `json:"index"`
	Score     any    `json:"score"` // a number, or null for a unit not solved
	Status    string `json:"status"`
	PeerCount int    `json:"peerCount"`
	Peers     []int  `json:"peers"`
}

// TestPooledRunMatchesNativeEngine opens a generated study of 3,000 units
// (engine/bench, the page runs it at once), cancels that run while the
// workers share it, checks that the page is untouched and still answers,
// runs the study again to the end and compares every unit's status, peers
// and peer count, exactly, and its score, within 1e-12, with the engine run
// natively on the same study (WebAssembly and native code round the last
// bit differently: gonum uses assembly kernels natively; the pooled run is
// compared bit for bit with a one-worker run in the test below). Source: the engine itself (dea.Run, whose numbers are checked
// against the GLPK oracle in engine/dea); this test checks that splitting
// the run over workers and putting it back together changes nothing.
func TestPooledRunMatchesNativeEngine(t *testing.T) {
	t.Parallel()
	tb := open(t, 1280, 900)
	s := bench.Study(bench.Config{Units: pooledUnits, Seed: 3}, dea.DefaultModel())
	var file bytes.Buffer
	if err := s.Write(&file); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(sitecopy.TempDir(t), "generated.json")
	if err := os.WriteFile(path, file.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := chromedp.Do(tb.ctx, chromedp.SetUploadFiles(chromedp.CSS("#open-study"), []string{path})); err != nil {
		t.Fatalf("choosing the study file: %v", err)
	}
	tb.waitFor(fmt.Sprintf(`window.peerlens.study && window.peerlens.study.units.length === %d && window.peerlens.running`, pooledUnits), 30*time.Second, "the opened study's run to start")
	before := eval[string](tb, `JSON.stringify(window.peerlens.study)`)
	tb.cancelRunning(before)

	// The page still answers: the same study runs to the end.
	tb.runStudy()
	got := eval[[]pooledUnit](tb, `window.peerlens.result.units.map(u => ({index: u.index, score: u.score, status: u.status, peerCount: u.peerCount, peers: u.peers.map(p => p.index)}))`)
	want := nativeRun(t, pageStudy(tb))
	if len(got) != len(want.Units) {
		t.Fatalf("the page has results for %d units, the native engine %d", len(got), len(want.Units))
	}
	bad := 0
	for k, w := range want.Units {
		g := got[k]
		peers := make([]int, len(w.Peers))
		for i, p := range w.Peers {
			peers[i] = p.Index
		}
		score, _ := g.Score.(float64)
		if g.Index != w.Index || math.Abs(score-w.Score) > 1e-12 || g.Status != string(w.Status) || g.PeerCount != w.PeerCount || !slices.Equal(g.Peers, peers) {
			if bad++; bad <= 10 {
				t.Errorf("unit %d: page %d score %v %s peers %v (named by %d); native %d score %v %s peers %v (named by %d)",
					k, g.Index, g.Score, g.Status, g.Peers, g.PeerCount, w.Index, w.Score, w.Status, peers, w.PeerCount)
			}
		}
	}
	if bad > 0 {
		t.Errorf("%d of %d units differ", bad, len(want.Units))
	}
}

// TestPooledRunUsesWorkersAndReportsPhases drives the page's engine module
// directly on the same kind of study: the run is shared by
// min(hardwareConcurrency, 8) workers besides the engine's own, reports the
// frontier phase first (units searched, up to the total) and then units
// done up to the total, and gives a result identical in every number (its
// JSON text) to the run on one worker (the units option, which always uses
// a single worker).
func TestPooledRunUsesWorkersAndReportsPhases(t *testing.T) {
	t.Parallel()
	tb := open(t, 1280, 900)
	s := bench.Study(bench.Config{Units: pooledUnits, Seed: 5}, dea.Model{Returns: dea.Variable, Orientation: dea.Input, SecondStage: true})
	var file bytes.Buffer
	if err := s.Write(&file); err != nil {
		t.Fatal(err)
	}
	type report struct {
		Workers, Expected, Units, Last, Total int
		Searched, FrontierTotal               int
		Phases                                []string
		Monotone                              bool
		Same                                  bool
	}
	r := eval[report](tb, `(async () => {
		const study = `+file.String()+`;
		let made = 0;
		const W = window.Worker;
		window.Worker = class extends W { constructor(...a) { super(...a); made++; } };
		const { Engine } = await import(new URL('engine.js', document.baseURI).href);
		const eng = await Engine.start();
		await new Promise(r => setTimeout(r, 200)); // the engine's spare runner is already counted
		const phases = [], dones = [], searched = [];
		let total = 0, frontierTotal = 0;
		const { promise } = eng.run(study, { onProgress(done, tot, phase) {
			if (phases[phases.length - 1] !== phase) phases.push(phase);
			if (phase === 'units') { dones.push(done); total = tot; }
			if (phase === 'frontier') { searched.push(done); frontierTotal = tot; }
		} });
		const res = await promise;
		const all = [...Array(study.units.length).keys()];
		const one = await eng.run(study, { units: all }).promise;
		eng.close();
		window.Worker = W;
		return {
			workers: made - 1, // less the engine's own worker for quick requests
			expected: Math.min(navigator.hardwareConcurrency || 2, 8),
			units: res.units.length,
			last: dones[dones.length - 1], total,
			phases,
			monotone: [dones, searched].every((ds) => ds.every((d, i) => i === 0 || d >= ds[i - 1])),
			searched: searched[searched.length - 1], frontierTotal,
			same: JSON.stringify(res) === JSON.stringify(one),
		};
	})()`)
	if r.Expected >= 2 && r.Workers != r.Expected {
		t.Errorf("the run used %d runner workers, want %d", r.Workers, r.Expected)
	}
	if r.Units != pooledUnits || r.Total != pooledUnits || r.Last != pooledUnits {
		t.Errorf("results for %d units, progress ended at %d of %d; want %d", r.Units, r.Last, r.Total, pooledUnits)
	}
	if strings.Join(r.Phases, ",") != "frontier,units" || !r.Monotone {
		t.Errorf("progress phases %v (never going back: %v), want frontier then units", r.Phases, r.Monotone)
	}
	if r.Searched != pooledUnits || r.FrontierTotal != pooledUnits {
		t.Errorf("frontier progress ended at %d of %d units searched, want %d", r.Searched, r.FrontierTotal, pooledUnits)
	}
	if !r.Same {
		t.Errorf("the shared run differs from the same run on one worker")
	}
}

// cancelRunning lets the page's run go on a moment, presses cancel, and
// checks that no results are shown, the status says so and the study is
// still before (its JSON when the run started).
func (tb *tab) cancelRunning(before string) {
	t := tb.t
	t.Helper()
	time.Sleep(300 * time.Millisecond)
	if !eval[bool](tb, `window.peerlens.running`) {
		t.Fatalf("the run finished before it could be cancelled; make the generated study larger")
	}
	tb.click("#cancel")
	tb.waitFor(`!window.peerlens.running`, 5*time.Second, "the run to stop")
	if !eval[bool](tb, `document.getElementById('results-body').hidden && window.peerlens.result === null`) {
		t.Errorf("results are shown after a cancelled run")
	}
	if s := eval[string](tb, `document.getElementById('run-status').textContent`); !strings.Contains(s, "Cancelled") {
		t.Errorf("run status after cancel is %q", s)
	}
	if after := eval[string](tb, `JSON.stringify(window.peerlens.study)`); after != before {
		t.Errorf("the study changed when the run was cancelled")
	}
}

// partsUnits is above the 16,384 units one part of the engine's frontier
// search covers, so the page searches several parts on its workers and
// checks their candidates once more.
const partsUnits = 20000

// TestPooledFrontierInParts drives the page's engine module on a study of
// more units than one part of the frontier search holds: the workers
// search the parts, then check the union in pieces, and the candidate set
// they hand to the units phase is exactly the one the engine finds in one
// call (the frontier request on the engine's own worker). Source: the engine
// itself (dea.Frontier); this checks the page's bookkeeping. The run is
// cancelled as soon as the units phase starts: the requests it posted show
// what it was about to do, and the units phase is tested above.
func TestPooledFrontierInParts(t *testing.T) {
	t.Parallel()
	tb := open(t, 1280, 900)
	s := bench.Study(bench.Config{Units: partsUnits, Seed: 9}, dea.DefaultModel())
	var file bytes.Buffer
	if err := s.Write(&file); err != nil {
		t.Fatal(err)
	}
	type report struct {
		Ops                    []string
		Runs                   [][2]int // part and parts of every run request
		Searched               []int
		FrontierTotal          int
		Sent, Want             []int
		Cancelled, AfterCancel bool
	}
	r := eval[report](tb, `(async () => {
		const study = `+file.String()+`;
		const ops = [], runs = [], searched = [];
		let sent = null, frontierTotal = 0, handle = null, cancelled = false, stopped = false;
		const W = window.Worker;
		window.Worker = class extends W {
			postMessage(m, ...rest) {
				if (m && m.op && m.op !== 'init') {
					ops.push(m.op);
					if (m.op === 'runJSON' && !stopped) {
						sent = sent || m.args[2];
						runs.push([m.args[3], m.args[4]]);
						setTimeout(() => { stopped = true; handle.cancel(); }, 0); // the frontier is known: stop here
					}
				}
				return super.postMessage(m, ...rest);
			}
		};
		const { Engine } = await import(new URL('engine.js', document.baseURI).href);
		const eng = await Engine.start();
		handle = eng.run(study, { onProgress(done, tot, phase) {
			if (phase === 'frontier') { searched.push(done); frontierTotal = tot; }
		} });
		try { await handle.promise; } catch (err) { cancelled = err.name === 'Cancelled'; }
		const want = (await eng.request('frontier', study)).frontier;
		// After the cancel a small run still works (fresh runners).
		const small = { ...study, leftOut: study.units.slice(50) };
		const after = await eng.run(small).promise;
		eng.close();
		window.Worker = W;
		return { ops: [...new Set(ops)], runs, searched, frontierTotal, sent: sent || [], want, cancelled, afterCancel: after.units.length === 50 };
	})()`)
	for _, op := range []string{"frontierParts", "frontierPart", "frontierCheck", "runJSON"} {
		if !slices.Contains(r.Ops, op) {
			t.Errorf("the shared run never asked a worker for %s (asked: %v)", op, r.Ops)
		}
	}
	if !slices.Equal(r.Sent, r.Want) {
		t.Errorf("the shared run found %d candidates, the engine in one call %d", len(r.Sent), len(r.Want))
	}
	k := len(r.Runs)
	for w, run := range r.Runs {
		if run != [2]int{w, k} {
			t.Errorf("run request %d asked for part %d of %d, want %d of %d", w, run[0], run[1], w, k)
		}
	}
	// 0 first, then once per part searched, growing to all units.
	if len(r.Searched) < 3 || r.Searched[0] != 0 || r.Searched[len(r.Searched)-1] != partsUnits || r.FrontierTotal != partsUnits ||
		!slices.IsSorted(r.Searched) {
		t.Errorf("frontier progress %v of %d, want 0, then growing once per part to %d", r.Searched, r.FrontierTotal, partsUnits)
	}
	if !r.Cancelled || !r.AfterCancel {
		t.Errorf("cancel gave Cancelled: %v; a run after it worked: %v", r.Cancelled, r.AfterCancel)
	}
}
