// Command browserbench measures a whole run in the page's own engine
// (site/engine.js, its pool of Web Workers and the engine built to
// WebAssembly) in headless Chromium, on generated studies (engine/bench:
// 3 inputs, 2 outputs, variable returns, input orientation, with slacks).
// It is a benchmark, not a test: it prints what it saw and checks only that
// every unit came back.
//
// Usage:
//
//	browserbench [-n 10000,100000] [-seed 1]
//
// For each size it builds nothing twice: the page is copied and the engine
// built once (site/sitecopy), served on 127.0.0.1 (site/server/static), and
// a fresh Chromium (fresh profile) opens an empty page of the same origin,
// loads the study as a file, and calls Engine.run from engine.js. It prints
// one line per size: units, runner workers used, wall time (from the call of
// run to the merged result) and its phases as the page's progress shows
// them (the frontier: its parts, then the last check; the units; then the
// results handed to the page and merged), progress updates seen, the peak of
// performance.memory.usedJSHeapSize on the page's thread (the workers' heaps
// are not in it), and the peaks of the summed resident memory (RSS) and of
// the summed proportional set size (PSS) of the Chromium processes, read
// from /proc every 500 ms (RSS counts shared pages once per process, so its
// sum overstates; PSS divides them, so its sum is the memory really used).
// Then the same as a JSON line.
package main

import (
	"bytes"
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"

	"github.com/chromedp/chromedp"

	"peerlens/engine/bench"
	"peerlens/engine/dea"
	"peerlens/site/server/static"
	"peerlens/site/sitecopy"
)

// Measure is one study size's figures.
type Measure struct {
	Units       int     `json:"units"`
	Workers     int     `json:"workers"` // runner workers the run used
	Processors  int     `json:"hardwareConcurrency"`
	WallSec     float64 `json:"wallSec"`
	FrontierSec float64 `json:"frontierSec"` // until the first units progress
	PartsSec    float64 `json:"partsSec"`    // until every part of the frontier search was done
	ComputedSec float64 `json:"computedSec"` // until the last units progress (all units evaluated)
	Updates     int     `json:"progressUpdates"`
	Frontier    int     `json:"frontier"`
	PeakHeapMB  float64 `json:"peakPageHeapMB"`
	PeakRSSMB   float64 `json:"peakChromiumRSSMB"`
	PeakPSSMB   float64 `json:"peakChromiumPSSMB"` // proportional set size: shared pages split, so the sum is the real total
	Load1       string  `json:"loadAverage"`       // /proc/loadavg at the start and at the end
}

// pageState is what the page keeps about the run, polled from here.
type pageState struct {
	Phase     string       `json:"phase"`
	Done      int          `json:"done"`
	Total     int          `json:"total"`
	Updates   int          `json:"updates"`
	HeapPeak  float64      `json:"heapPeak"`
	Finished  bool         `json:"finished"`
	Error     string       `json:"error"`
	Workers   int          `json:"workers"`
	Procs     int          `json:"procs"`
	WallMS    float64      `json:"wallMs"`
	FrontMS   float64      `json:"frontierMs"`
	PartsMS   float64      `json:"partsMs"`
	CompMS    float64      `json:"computedMs"`
	Units     int          `json:"units"`
	Frontier  int          `json:"frontier"`
	Unordered int          `json:"unordered"`
	Arrived   [][2]float64 `json:"arrived"`
}

func main() {
	sizes := flag.String("n", "10000,100000", "study sizes, comma separated")
	seed := flag.Uint64("seed", 1, "generator seed")
	chrome := flag.String("chromium", "/usr/bin/chromium", "the Chromium binary")
	limit := flag.Duration("timeout", 30*time.Minute, "give up on one size after this long")
	flag.Parse()
	if err := run(*sizes, *seed, *chrome, *limit); err != nil {
		fmt.Fprintln(os.Stderr, "browserbench:", err)
		os.Exit(1)
	}
}

func run(sizes string, seed uint64, chrome string, limit time.Duration) error {
	root, err := sitecopy.ModuleRoot()
	if err != nil {
		return err
	}
	tmp, err := os.MkdirTemp("", "peerlens-browserbench-")
	if err != nil {
		return err
	}
	defer os.RemoveAll(tmp)
	site := filepath.Join(tmp, "site")
	if err := sitecopy.Prepare(root, site); err != nil {
		return err
	}
	if err := os.WriteFile(filepath.Join(site, "bench.html"), []byte("<!doctype html><meta charset=utf-8><title>Peerlens browser bench</title>\n"), 0o644); err != nil {
		return err
	}
	srv, err := static.Start(site, "127.0.0.1:0")
	if err != nil {
		return err
	}
	defer srv.Close()
	model := dea.Model{Returns: dea.Variable, Orientation: dea.Input, SecondStage: true}
	for _, f := range strings.Split(sizes, ",") {
		n, err := strconv.Atoi(strings.TrimSpace(f))
		if err != nil || n <= 0 {
			return fmt.Errorf("bad study size %q", f)
		}
		var b bytes.Buffer
		if err := bench.Study(bench.Config{Units: n, Seed: seed}, model).Write(&b); err != nil {
			return err
		}
		name := fmt.Sprintf("study-%d.json", n)
		if err := os.WriteFile(filepath.Join(site, name), b.Bytes(), 0o644); err != nil {
			return err
		}
		m, err := measure(srv.URL, name, chrome, filepath.Join(tmp, fmt.Sprintf("profile-%d", n)), limit)
		if err != nil {
			return fmt.Errorf("%d units: %w", n, err)
		}
		os.Remove(filepath.Join(site, name))
		fmt.Printf("browser: %d units, %d runner workers (hardwareConcurrency %d), wall %.2f s (frontier %.2f s: parts %.2f s, last check %.2f s; units %.2f s; results to the page %.2f s), %d progress updates, frontier %d units, peak page heap %.1f MB, peak Chromium RSS (sum) %.0f MB, PSS (sum) %.0f MB, load average %s\n",
			m.Units, m.Workers, m.Processors, m.WallSec, m.FrontierSec, m.PartsSec, m.FrontierSec-m.PartsSec, m.ComputedSec-m.FrontierSec, m.WallSec-m.ComputedSec,
			m.Updates, m.Frontier, m.PeakHeapMB, m.PeakRSSMB, m.PeakPSSMB, m.Load1)
		line, _ := json.Marshal(m)
		fmt.Println(string(line))
	}
	return nil
}

// startJS loads the study and starts the run; the page keeps its state in
// window.benchState for measure to poll.
const startJS = `(async () => {
	const st = window.benchState = {phase: 'loading', done: 0, total: 0, updates: 0, heapPeak: 0, finished: false, error: '', workers: 0,
		procs: navigator.hardwareConcurrency || 0};
	const heap = () => { if (performance.memory) st.heapPeak = Math.max(st.heapPeak, performance.memory.usedJSHeapSize); };
	const timer = setInterval(heap, 250);
	try {
		let made = 0;
		const W = window.Worker;
		// Results arriving from the runners: when the message came, and when
		// its value was read (structured clone is undone on first access).
		st.arrived = [];
		window.Worker = class extends W { constructor(...a) { super(...a); made++;
			this.addEventListener('message', (e) => {
				const t = performance.now();
				const m = e.data;
				if (m && m.type === 'result' && st.t0) st.arrived.push([t - st.t0, performance.now() - st.t0]);
			});
		} };
		const { Engine } = await import(new URL('engine.js', document.baseURI).href);
		const eng = await Engine.start();
		const study = await (await fetch(%q)).json();
		await new Promise((r) => setTimeout(r, 500)); // the spare runner warms up
		const before = made;
		const t0 = st.t0 = performance.now();
		const { promise } = eng.run(study, { onProgress(done, total, phase) {
			const now = performance.now() - t0;
			if (phase === 'units' && st.phase !== 'units') st.frontierMs = now;
			if (phase === 'frontier' && done === total && !st.partsMs) st.partsMs = now;
			if (phase === 'units' && done === total) st.computedMs = now;
			st.phase = phase; st.done = done; st.total = total; st.updates++;
			heap();
		} });
		const res = await promise;
		st.wallMs = performance.now() - t0;
		heap();
		st.workers = made - before + 1; // the spare runner was made before
		st.units = res.units.length;
		st.frontier = (res.frontier || []).length;
		st.unordered = res.units.filter((u, k) => u.index !== k).length;
		eng.close();
		window.Worker = W;
	} catch (err) {
		st.error = String(err && err.message || err);
	}
	clearInterval(timer);
	st.finished = true;
})(), true`

func measure(base, studyFile, chrome, profile string, limit time.Duration) (*Measure, error) {
	opts := append(sitecopy.ChromiumOptions(chrome, profile), chromedp.Flag("enable-precise-memory-info", true))
	actx, cancelAlloc := chromedp.NewExecAllocator(context.Background(), opts...)
	defer cancelAlloc()
	ctx, cancelCtx := chromedp.NewContext(actx)
	defer cancelCtx()
	ctx, cancelTime := context.WithTimeout(ctx, limit)
	defer cancelTime()
	m := &Measure{Load1: loadAverage()}
	if err := chromedp.Do(ctx, chromedp.Navigate(base+"bench.html")); err != nil {
		return nil, fmt.Errorf("opening the page: %w", err)
	}
	if err := chromedp.Do(ctx, chromedp.Evaluate[chromedp.Void](fmt.Sprintf(startJS, studyFile))); err != nil {
		return nil, fmt.Errorf("starting the run: %w", err)
	}
	var st pageState
	var err error
	tick := time.NewTicker(500 * time.Millisecond)
	defer tick.Stop()
	lastPrint := time.Now()
	for {
		rss, pss := chromiumMemory()
		m.PeakPSSMB = max(m.PeakPSSMB, pss)
		if rss > m.PeakRSSMB {
			m.PeakRSSMB = rss
		}
		if st, err = chromedp.Run(ctx, chromedp.Evaluate[pageState](`window.benchState`)); err != nil {
			return nil, fmt.Errorf("reading the page: %w", err)
		}
		if st.Finished {
			break
		}
		if time.Since(lastPrint) > 10*time.Second {
			fmt.Fprintf(os.Stderr, "  ... %s %d of %d, RSS peak %.0f MB\n", st.Phase, st.Done, st.Total, m.PeakRSSMB)
			lastPrint = time.Now()
		}
		<-tick.C
	}
	if st.Error != "" {
		return nil, fmt.Errorf("the run failed in the page: %s", st.Error)
	}
	if st.Unordered != 0 || st.Units != st.Total {
		return nil, fmt.Errorf("the page returned %d units of %d (%d out of order)", st.Units, st.Total, st.Unordered)
	}
	m.Units, m.Workers, m.Processors = st.Units, st.Workers, st.Procs
	m.WallSec, m.FrontierSec = st.WallMS/1000, st.FrontMS/1000
	m.PartsSec, m.ComputedSec = st.PartsMS/1000, st.CompMS/1000
	m.Updates, m.Frontier = st.Updates, st.Frontier
	m.PeakHeapMB = st.HeapPeak / (1 << 20)
	m.Load1 += " -> " + loadAverage()
	fmt.Fprintf(os.Stderr, "  results arrived (ms since run, ms after reading them): %v\n", st.Arrived)
	return m, nil
}

// chromiumMemory sums the resident memory (RSS) and the proportional set
// size (PSS, from smaps_rollup: each shared page divided among the
// processes sharing it) of this program's descendants (the Chromium
// processes chromedp started), in MB.
func chromiumMemory() (rssTotal, pssTotal float64) {
	entries, err := os.ReadDir("/proc")
	if err != nil {
		return 0, 0
	}
	parent := map[int]int{}
	rss := map[int]float64{}
	for _, e := range entries {
		pid, err := strconv.Atoi(e.Name())
		if err != nil {
			continue
		}
		b, err := os.ReadFile(filepath.Join("/proc", e.Name(), "status"))
		if err != nil {
			continue
		}
		for _, line := range strings.Split(string(b), "\n") {
			f := strings.Fields(line)
			switch {
			case len(f) >= 2 && f[0] == "PPid:":
				parent[pid], _ = strconv.Atoi(f[1])
			case len(f) >= 2 && f[0] == "VmRSS:":
				kb, _ := strconv.ParseFloat(f[1], 64)
				rss[pid] = kb / 1024
			}
		}
	}
	self := os.Getpid()
	for pid, mb := range rss {
		for p := parent[pid]; p > 1; p = parent[p] {
			if p == self {
				rssTotal += mb
				pssTotal += pssMB(pid)
				break
			}
		}
	}
	return rssTotal, pssTotal
}

// pssMB reads a process's proportional set size, in MB (0 when unknown).
func pssMB(pid int) float64 {
	b, err := os.ReadFile(filepath.Join("/proc", strconv.Itoa(pid), "smaps_rollup"))
	if err != nil {
		return 0
	}
	for _, line := range strings.Split(string(b), "\n") {
		if f := strings.Fields(line); len(f) >= 2 && f[0] == "Pss:" {
			kb, _ := strconv.ParseFloat(f[1], 64)
			return kb / 1024
		}
	}
	return 0
}

func loadAverage() string {
	b, err := os.ReadFile("/proc/loadavg")
	if err != nil {
		return "?"
	}
	f := strings.Fields(string(b))
	if len(f) < 3 {
		return "?"
	}
	return strings.Join(f[:3], " ")
}
