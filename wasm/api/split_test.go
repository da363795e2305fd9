package api

import (
	"bytes"
	"context"
	"encoding/json"
	"reflect"
	"strings"
	"testing"

	"peerlens/engine/bench"
	"peerlens/engine/dea"
)

// generatedJSON is a generated study (engine/bench) in its file form.
func generatedJSON(t *testing.T, n int) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := bench.Study(bench.Config{Units: n, Seed: 7}, dea.DefaultModel()).Write(&b); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

// A run split the way the page splits it over workers (the frontier once,
// then interleaved shares of the units with that frontier, merged) gives
// the same scores, statuses, peers and peer counts as one whole run. The
// whole run is the reference: its numbers are checked against the GLPK
// oracle in engine/dea; here only the bookkeeping of the split is tested.
func TestSplitRunEqualsOneRun(t *testing.T) {
	ctx := context.Background()
	sj := generatedJSON(t, 700) // above two blocks, so the frontier is screened
	wj, err := Run(ctx, sj, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	whole, err := ReadResult(wj)
	if err != nil {
		t.Fatal(err)
	}
	fj, err := Frontier(ctx, sj)
	if err != nil {
		t.Fatal(err)
	}
	var fs FrontierSet
	if err := json.Unmarshal(fj, &fs); err != nil {
		t.Fatal(err)
	}
	if fs.Units != 700 || len(fs.Frontier) == 0 || len(fs.Frontier) >= 700 {
		t.Fatalf("frontier: %d candidates of %d units", len(fs.Frontier), fs.Units)
	}
	if !reflect.DeepEqual(fs.Frontier, whole.Frontier) {
		t.Errorf("Frontier gives %d candidates, the whole run used %d", len(fs.Frontier), len(whole.Frontier))
	}
	const k = 3
	var parts []*dea.Result
	for w := 0; w < k; w++ {
		var units []int
		for j := w; j < fs.Units; j += k {
			units = append(units, j)
		}
		calls := 0
		pj, err := RunPart(ctx, sj, units, fs.Frontier, func(done, total int) {
			calls++
			if total != len(units) {
				t.Errorf("part %d: progress total %d, want %d", w, total, len(units))
			}
		})
		if err != nil {
			t.Fatal(err)
		}
		if calls == 0 {
			t.Errorf("part %d reported no progress", w)
		}
		p, err := ReadResult(pj)
		if err != nil {
			t.Fatal(err)
		}
		parts = append(parts, p)
	}
	merged, err := dea.Merge(parts...)
	if err != nil {
		t.Fatal(err)
	}
	if len(merged.Units) != len(whole.Units) {
		t.Fatalf("merged %d units, whole run %d", len(merged.Units), len(whole.Units))
	}
	for j, u := range merged.Units {
		w := whole.Units[j]
		if u.Index != w.Index || u.Score != w.Score || u.Status != w.Status || u.PeerCount != w.PeerCount || !reflect.DeepEqual(u.Peers, w.Peers) {
			t.Errorf("unit %d: split %d %v %s peers %v (%d), whole %d %v %s peers %v (%d)",
				j, u.Index, u.Score, u.Status, u.Peers, u.PeerCount, w.Index, w.Score, w.Status, w.Peers, w.PeerCount)
		}
	}
}

func TestRunPartRejectsAForeignFrontier(t *testing.T) {
	sj := demoJSON(t)
	for name, f := range map[string][]int{
		"empty":        {},
		"out of range": {0, 999},
		"negative":     {-1},
		"repeated":     {2, 2},
	} {
		_, err := RunPart(context.Background(), sj, nil, f, nil)
		if err == nil || !strings.Contains(err.Error(), "frontier") {
			t.Errorf("%s: err = %v, want a message about the frontier", name, err)
		}
	}
	if _, err := Frontier(context.Background(), []byte("[]")); err == nil {
		t.Error("Frontier of junk should fail")
	}
}
