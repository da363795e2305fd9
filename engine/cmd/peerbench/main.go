// Command peerbench measures the DEA engine on generated studies (see
// package peerlens/engine/bench) and prints one JSON line per study size.
// The same program is built natively and as WebAssembly (GOOS=js, run under
// Node), so both runtimes do exactly the same work; ./build.sh bench runs
// both, the general-purpose baseline, and prints the comparison table.
//
// Usage:
//
//	peerbench [-n 1000,10000] [-seed 1] [-workers 1]   measure, JSON lines out
//	peerbench -data DIR [-n ...]                        write each study as JSON for the baseline
//	peerbench -table FILE...                            print the table from JSON lines
//
// Each measurement line holds: the runtime, the number of units, the size of
// the candidate set, the engine's time (whole run: candidate set, every
// unit's radial and slack stages, certificates), the time of the candidate
// set alone, the floor (one pass of multiply-adds over units x candidate
// units x measures, bench.Floor) and memory figures.
package main

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"time"

	"peerlens/engine/bench"
	"peerlens/engine/dea"
)

// Measure is one line of output.
type Measure struct {
	Runtime     string  `json:"runtime"` // "native" or "wasm"
	Units       int     `json:"units"`
	Frontier    int     `json:"frontier"`     // candidate set size
	Efficient   int     `json:"efficient"`    // units with score 1
	Verified    int     `json:"verified"`     // units whose certificate holds
	NotSolved   int     `json:"notSolved"`    // units whose program failed
	EngineSec   float64 `json:"engineSec"`    // whole run
	FrontierSec float64 `json:"frontierSec"`  // candidate set alone
	FloorSec    float64 `json:"floorSec"`     // bench.Floor over the candidate set
	EngineCPU   float64 `json:"engineCPUSec"` // CPU time of the whole run
	FloorCPU    float64 `json:"floorCPUSec"`  // CPU time of the floor
	Workers     int     `json:"workers"`
	GoSysMB     float64 `json:"goSysMB"`  // memory the Go runtime obtained from the system
	MaxRSSMB    float64 `json:"maxRSSMB"` // the process's peak resident memory
}

// Baseline is one line of the general-purpose solver's output (written by
// engine/bench/highs_baseline.js).
type Baseline struct {
	Runtime     string  `json:"runtime"` // "highs"
	Units       int     `json:"units"`
	Sampled     int     `json:"sampled"`
	PerUnitSec  float64 `json:"perUnitSec"`    // both stages, text written and solved
	SolveSec    float64 `json:"solveSec"`      // per unit, solver calls alone
	PerUnitCPU  float64 `json:"perUnitCPUSec"` // per unit, CPU time of the process
	TotalSec    float64 `json:"totalSec"`      // PerUnitSec * Units
	MaxAbsDiff  float64 `json:"maxScoreDiff"`  // largest |score - engine score| over the sample
	MaxRSSMB    float64 `json:"maxRSSMB"`
	Compared    int     `json:"compared"`
	Description string  `json:"description"`
}

func main() {
	sizes := flag.String("n", "1000,10000", "study sizes, comma separated")
	seed := flag.Uint64("seed", 1, "generator seed")
	workers := flag.Int("workers", 1, "goroutines for the engine (the floor always uses one)")
	data := flag.String("data", "", "write each study (and the engine's scores) as JSON into this directory instead of measuring")
	table := flag.Bool("table", false, "print the comparison table from the JSON lines in the files named as arguments")
	flag.Parse()
	if *table {
		if err := printTable(os.Stdout, flag.Args()); err != nil {
			fmt.Fprintln(os.Stderr, "peerbench:", err)
			os.Exit(1)
		}
		return
	}
	for _, f := range strings.Split(*sizes, ",") {
		n, err := strconv.Atoi(strings.TrimSpace(f))
		if err != nil || n <= 0 {
			fmt.Fprintf(os.Stderr, "peerbench: bad size %q\n", f)
			os.Exit(2)
		}
		d := bench.Generate(bench.Config{Units: n, Seed: *seed})
		if *data != "" {
			err = writeData(*data, n, d)
		} else {
			err = measure(d, *workers)
		}
		if err != nil {
			fmt.Fprintln(os.Stderr, "peerbench:", err)
			os.Exit(1)
		}
	}
}

// model is the setting of the speed goals: variable returns, input
// orientation, slacks and peers.
var model = dea.Model{Returns: dea.Variable, Orientation: dea.Input, SecondStage: true}

func measure(d *dea.Data, workers int) error {
	ctx := context.Background()
	runtime.GC()
	t0 := time.Now()
	f, err := dea.Frontier(ctx, d)
	if err != nil {
		return err
	}
	frontierSec := time.Since(t0).Seconds()
	runtime.GC()
	t0, c0 := time.Now(), cpuSeconds()
	res, err := dea.RunWith(ctx, d, model, dea.Options{Workers: workers})
	if err != nil {
		return err
	}
	engineSec, engineCPU := time.Since(t0).Seconds(), cpuSeconds()-c0
	// The floor is fast; repeat it until the timing is steady.
	reps := 0
	for t0, c0 = time.Now(), cpuSeconds(); reps < 3 || time.Since(t0) < 500*time.Millisecond; reps++ {
		bench.Floor(d, res.Frontier)
	}
	floorSec := time.Since(t0).Seconds() / float64(reps)
	floorCPU := (cpuSeconds() - c0) / float64(reps)
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	m := Measure{
		Runtime: "native", Units: len(d.X), Frontier: len(res.Frontier),
		EngineSec: engineSec, FrontierSec: frontierSec, FloorSec: floorSec,
		EngineCPU: engineCPU, FloorCPU: floorCPU,
		Workers: workers, GoSysMB: float64(ms.Sys) / (1 << 20), MaxRSSMB: maxRSSMB(),
	}
	if runtime.GOOS == "js" {
		m.Runtime = "wasm"
	}
	if len(f) != len(res.Frontier) {
		return fmt.Errorf("candidate set of %d units once and %d units again", len(f), len(res.Frontier))
	}
	for _, u := range res.Units {
		switch {
		case u.Status == dea.NotSolved:
			m.NotSolved++
		case u.Score >= 1-1e-9:
			m.Efficient++
		}
		if u.Cert.Verified {
			m.Verified++
		}
	}
	return json.NewEncoder(os.Stdout).Encode(m)
}

// study is what the baseline reads: the data and the engine's scores, for
// comparing answers as well as times.
type study struct {
	X     [][]float64 `json:"x"`
	Y     [][]float64 `json:"y"`
	Score []float64   `json:"score"`
}

func writeData(dir string, n int, d *dea.Data) error {
	res, err := dea.Run(context.Background(), d, model, nil)
	if err != nil {
		return err
	}
	s := study{X: d.X, Y: d.Y, Score: make([]float64, n)}
	for k, u := range res.Units {
		s.Score[k] = u.Score
	}
	b, err := json.Marshal(s)
	if err != nil {
		return err
	}
	return os.WriteFile(filepath.Join(dir, fmt.Sprintf("study-%d.json", n)), b, 0o644)
}
