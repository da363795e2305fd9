package api

import (
	"bytes"
	"context"
	"encoding/json"
	"slices"
	"strings"
	"testing"

	"peerlens/engine/bench"
	"peerlens/engine/dea"
	"peerlens/engine/export"
	"peerlens/engine/study"
)

// generatedJSON is a generated study (engine/bench) in its file form.
func generatedJSON(t testing.TB, n int) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := bench.Study(bench.Config{Units: n, Seed: 7}, dea.DefaultModel()).Write(&b); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

// decode returns a function that reads a JSON answer of this package (and
// its error, which fails the test) as a T.
func decode[T any](t testing.TB) func([]byte, error) T {
	return func(b []byte, err error) T {
		t.Helper()
		var v T
		if err != nil {
			t.Fatal(err)
		}
		if err := json.Unmarshal(b, &v); err != nil {
			t.Fatalf("%v\n%.200s", err, b)
		}
		return v
	}
}

// SplitFrontier finds the candidate set the way the page does with several
// workers: every part on its own, the union sorted, then the last check in
// pieces pieces.
func splitFrontier(t testing.TB, sj []byte, pieces int) (PartsInfo, []int) {
	t.Helper()
	ctx := context.Background()
	info := decode[PartsInfo](t)(FrontierParts(sj))
	var pool []int
	for p := range info.Parts {
		c := decode[Candidates](t)(FrontierPart(ctx, sj, p))
		if len(c.Candidates) == 0 || len(c.Candidates) > info.Sizes[p] {
			t.Fatalf("part %d of %d units has %d candidates", p, info.Sizes[p], len(c.Candidates))
		}
		pool = append(pool, c.Candidates...)
	}
	slices.Sort(pool)
	if info.Parts == 1 {
		return info, pool
	}
	var front []int
	for k := range pieces {
		lo, hi := k*len(pool)/pieces, (k+1)*len(pool)/pieces
		front = append(front, decode[Kept](t)(FrontierCheck(ctx, sj, pool, lo, hi)).Kept...)
	}
	return info, front
}

// The frontier search split into parts and pieces, as the page splits it
// over workers, finds the same candidate set as one call of Frontier. The
// study has more units than one part holds (16,384), so the last check
// matters. Source: the engine itself (dea.Frontier; that evaluating against
// its set changes no result is checked against the GLPK oracle in
// engine/dea); only the bookkeeping of the split is tested here.
func TestSplitFrontierEqualsFrontier(t *testing.T) {
	sj := generatedJSON(t, 20000)
	whole := decode[FrontierSet](t)(Frontier(context.Background(), sj))
	for _, pieces := range []int{1, 2, 5} {
		info, front := splitFrontier(t, sj, pieces)
		if info.Parts < 2 || info.Units != 20000 {
			t.Fatalf("parts %+v: want at least two parts of 20000 units", info)
		}
		sum := 0
		for _, n := range info.Sizes {
			sum += n
		}
		if sum != info.Units {
			t.Errorf("part sizes %v add up to %d, not %d", info.Sizes, sum, info.Units)
		}
		if !slices.Equal(front, whole.Frontier) {
			t.Errorf("%d pieces: split search gives %d candidates, Frontier %d", pieces, len(front), len(whole.Frontier))
		}
	}
}

// A run shared as the page shares it (the frontier found in parts, then
// part w of k of the units on each worker with that frontier, merged) is
// identical, byte for byte in its JSON form, to one whole run. The whole
// run is the reference: its numbers are checked against the GLPK oracle in
// engine/dea; here only the bookkeeping of the split is tested.
func TestSharedRunEqualsOneRun(t *testing.T) {
	ctx := context.Background()
	sj := generatedJSON(t, 1500) // above two blocks, so the frontier is screened; 12 chunks of units
	wj, err := Run(ctx, sj, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	info, front := splitFrontier(t, sj, 2)
	if info.Parts != 1 || len(front) == 0 || len(front) >= 1500 {
		t.Fatalf("frontier: %d parts, %d candidates of %d units", info.Parts, len(front), info.Units)
	}
	for _, k := range []int{2, 3, 5} {
		var parts []*dea.Result
		for w := range k {
			calls, last := 0, 0
			pj, err := RunShare(ctx, sj, Share{Frontier: front, Part: w, Parts: k}, func(done, total int) {
				calls, last = calls+1, done
			})
			if err != nil {
				t.Fatal(err)
			}
			p, err := ReadResult(pj)
			if err != nil {
				t.Fatal(err)
			}
			if calls == 0 || last != len(p.Units) {
				t.Errorf("share %d of %d: %d progress reports ending at %d, want some ending at %d", w, k, calls, last, len(p.Units))
			}
			parts = append(parts, p)
		}
		merged, err := dea.Merge(parts...)
		if err != nil {
			t.Fatal(err)
		}
		mj, err := export.JSON(merged)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(mj, wj) {
			t.Errorf("%d shares merged differ from the whole run (%d and %d bytes of JSON)", k, len(mj), len(wj))
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

// Requests that cannot belong to the study get a message saying what is
// wrong with them.
func TestSplitRequestsRejectBadArguments(t *testing.T) {
	ctx := context.Background()
	sj := demoJSON(t)
	n := len(study.Demo().Units)
	bad := study.Demo()
	bad.Values[0][0] = -1
	var nb bytes.Buffer
	if err := bad.Write(&nb); err != nil {
		t.Fatal(err)
	}
	negative := nb.Bytes()
	for _, tc := range []struct {
		name string
		err  func() error
		want string
	}{
		{"part -1", func() error { _, err := FrontierPart(ctx, sj, -1); return err }, "has no part -1: this study has 1"},
		{"part 1", func() error { _, err := FrontierPart(ctx, sj, 1); return err }, "has no part 1"},
		{"empty pool", func() error { _, err := FrontierCheck(ctx, sj, []int{}, 0, 0); return err }, "pool of candidates to check is empty"},
		{"pool out of range", func() error { _, err := FrontierCheck(ctx, sj, []int{0, n}, 0, 1); return err }, "names unit"},
		{"pool repeated", func() error { _, err := FrontierCheck(ctx, sj, []int{1, 1}, 0, 1); return err }, "twice"},
		{"pool unsorted", func() error { _, err := FrontierCheck(ctx, sj, []int{2, 1}, 0, 1); return err }, "increasing order"},
		{"piece reversed", func() error { _, err := FrontierCheck(ctx, sj, []int{1, 2}, 2, 1); return err }, "from 2 to 1"},
		{"piece beyond", func() error { _, err := FrontierCheck(ctx, sj, []int{1, 2}, 0, 3); return err }, "pool of 2 candidates"},
		{"piece negative", func() error { _, err := FrontierCheck(ctx, sj, []int{1, 2}, -1, 1); return err }, "from -1 to 1"},
		{"share beyond", func() error { _, err := RunShare(ctx, sj, Share{Part: 2, Parts: 2}, nil); return err }, "share 2 of a run shared among 2 workers does not exist"},
		{"share negative", func() error { _, err := RunShare(ctx, sj, Share{Part: -1, Parts: 3}, nil); return err }, "numbered from 0 to 2"},
		{"no workers", func() error { _, err := RunShare(ctx, sj, Share{Part: 0, Parts: -2}, nil); return err }, "among -2 workers"},
		{"share and units", func() error { _, err := RunShare(ctx, sj, Share{Units: []int{0}, Part: 0, Parts: 2}, nil); return err }, "cannot also have its own list"},
		{"parts of junk", func() error { _, err := FrontierParts([]byte("[]")); return err }, ""},
		{"parts of bad data", func() error { _, err := FrontierParts(negative); return err }, `"Market Square" has a negative value`},
	} {
		err := tc.err()
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: err = %v, want one containing %q", tc.name, err, tc.want)
		}
	}
}

// The last study read is kept for the next request, but only a study of
// exactly the same bytes is served from it: two studies that differ in one
// value, asked for in turn, each get their own results.
func TestStudyCacheNeverMixesStudies(t *testing.T) {
	ctx := context.Background()
	a := demoJSON(t)
	s := study.Demo()
	s.Values[0][0] *= 3 // the first unit uses three times the input: a different study
	var bb bytes.Buffer
	if err := s.Write(&bb); err != nil {
		t.Fatal(err)
	}
	b := bb.Bytes()
	if bytes.Equal(a, b) {
		t.Fatal("the changed study has the same file form")
	}
	fresh := func(sj []byte) []byte { // a run that cannot have come from the cache
		t.Helper()
		last.Lock()
		last.l = nil
		last.Unlock()
		r, err := Run(ctx, sj, nil, nil)
		if err != nil {
			t.Fatal(err)
		}
		return r
	}
	wantA, wantB := fresh(a), fresh(b)
	if bytes.Equal(wantA, wantB) {
		t.Fatal("the two studies have the same results; the test cannot tell them apart")
	}
	for i, sj := range [][]byte{a, a, b, b, a, b} {
		got, err := Run(ctx, sj, nil, nil)
		if err != nil {
			t.Fatal(err)
		}
		want := wantA
		if bytes.Equal(sj, b) {
			want = wantB
		}
		if !bytes.Equal(got, want) {
			t.Errorf("request %d got the results of the other study", i)
		}
	}
	// The same bytes are read once; the cache keeps its own copy, so a
	// caller reusing its buffer changes nothing.
	buf := bytes.Clone(a)
	l1, err := load(buf)
	if err != nil {
		t.Fatal(err)
	}
	l2, err := load(a)
	if err != nil || l1 != l2 {
		t.Errorf("the same bytes were read again (%v)", err)
	}
	for i := range buf {
		buf[i] = ' '
	}
	if l3, err := load(a); err != nil || l3 != l1 {
		t.Errorf("changing the caller's buffer changed what the cache holds (%v)", err)
	}
	if l4, err := load(b); err != nil || l4 == l1 {
		t.Errorf("other bytes were served from the cache (%v)", err)
	}
}
