package dea

import (
	"context"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// cobbDouglas makes n units with m inputs and s outputs near a Cobb-Douglas
// frontier, with half-normal inefficiency and a share of units exactly on it
// (a generator of our own; the numbers are invented).
func cobbDouglas(n, m, s int, seed uint64) *Data {
	rng := rand.New(rand.NewPCG(seed, 99))
	d := &Data{X: make([][]float64, n), Y: make([][]float64, n)}
	for j := 0; j < n; j++ {
		x := make([]float64, m)
		prod := 1.0
		for i := range x {
			x[i] = 1 + 99*rng.Float64()
			prod *= math.Pow(x[i], 0.8/float64(m))
		}
		eff := 1.0
		if rng.Float64() > 0.05 {
			eff = math.Exp(-math.Abs(rng.NormFloat64()) * 0.3)
		}
		y := make([]float64, s)
		// Split output among outputs along a random direction on the frontier.
		w := make([]float64, s)
		tot := 0.0
		for r := range w {
			w[r] = 0.2 + rng.Float64()
			tot += w[r] * w[r]
		}
		for r := range y {
			y[r] = prod * eff * w[r] / math.Sqrt(tot)
		}
		d.X[j], d.Y[j] = x, y
	}
	return d
}

// The frontier-first run gives the same scores and slack sums as evaluating
// every unit against all units (see Frontier's doc comment for why).
func TestFrontierFirstMatchesFull(t *testing.T) {
	d := cobbDouglas(1500, 3, 2, 1)
	for _, m := range []Model{
		{Returns: Variable, Orientation: Input, SecondStage: true},
		{Returns: Constant, Orientation: Output, SecondStage: true},
		{Returns: NonIncreasing, Orientation: Input, SecondStage: true},
	} {
		ctx := context.Background()
		fast, err := Run(ctx, d, m, nil)
		if err != nil {
			t.Fatal(err)
		}
		if len(fast.Frontier) >= 1500 {
			t.Fatalf("candidate set not reduced: %d", len(fast.Frontier))
		}
		all := make([]int, 1500)
		for j := range all {
			all[j] = j
		}
		full, err := RunWith(ctx, d, m, Options{Frontier: all})
		if err != nil {
			t.Fatal(err)
		}
		for k := range fast.Units {
			a, b := fast.Units[k], full.Units[k]
			if math.Abs(a.Score-b.Score) > 1e-8 {
				t.Errorf("%v unit %d: score %v with candidates, %v with all", m.Returns, k, a.Score, b.Score)
			}
			if math.Abs(slackSum(a)-slackSum(b)) > 1e-6*(1+slackSum(b)) {
				t.Errorf("%v unit %d: slack sum %v vs %v", m.Returns, k, slackSum(a), slackSum(b))
			}
			if !a.Cert.Verified {
				t.Errorf("%v unit %d not verified: %+v", m.Returns, k, a.Cert)
			}
		}
	}
}

func slackSum(u UnitResult) float64 {
	t := 0.0
	for _, x := range u.Inputs {
		t += x.Slack
	}
	for _, x := range u.Outputs {
		t += x.Slack
	}
	return t
}

func benchRun(b *testing.B, n int) {
	d := cobbDouglas(n, 3, 2, 7)
	m := Model{Returns: Variable, Orientation: Input, SecondStage: true}
	b.ResetTimer()
	for k := 0; k < b.N; k++ {
		if _, err := RunWith(context.Background(), d, m, Options{Workers: 1}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkVRSInput1000(b *testing.B)  { benchRun(b, 1000) }
func BenchmarkVRSInput10000(b *testing.B) { benchRun(b, 10000) }

// Runs over parts of the units, merged, give the same result as one run,
// bit for bit, and so does a run on more goroutines.
func TestMergeEqualsOneRun(t *testing.T) {
	d := cobbDouglas(700, 2, 2, 3) // several chunks
	m := DefaultModel()
	ctx := context.Background()
	whole, err := RunWith(ctx, d, m, Options{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	var parts []*Result
	for w := 0; w < 3; w++ {
		r, err := RunWith(ctx, d, m, Options{Part: w, Parts: 3, Frontier: whole.Frontier})
		if err != nil {
			t.Fatal(err)
		}
		parts = append(parts, r)
	}
	merged, err := Merge(parts[2], parts[0], parts[1])
	if err != nil {
		t.Fatal(err)
	}
	two, err := RunWith(ctx, d, m, Options{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	for _, other := range []*Result{merged, two} {
		if len(other.Units) != len(whole.Units) {
			t.Fatalf("%d units, want %d", len(other.Units), len(whole.Units))
		}
		for k, u := range other.Units {
			w := whole.Units[k]
			if u.Index != w.Index || u.Score != w.Score || u.PeerCount != w.PeerCount || len(u.Peers) != len(w.Peers) {
				t.Errorf("unit %d: %d %v %d, whole %d %v %d", k, u.Index, u.Score, u.PeerCount, w.Index, w.Score, w.PeerCount)
			}
		}
	}
	if _, err := Merge(parts[0], parts[0]); err == nil {
		t.Error("merging a part twice should fail")
	}
	// Any list of units gives the same scores, to rounding.
	var units []int
	for j := 1; j < 700; j += 3 {
		units = append(units, j)
	}
	some, err := RunWith(ctx, d, m, Options{Units: units, Frontier: whole.Frontier})
	if err != nil {
		t.Fatal(err)
	}
	for k, u := range some.Units {
		if w := whole.Units[units[k]]; u.Index != w.Index || math.Abs(u.Score-w.Score) > 1e-12 {
			t.Errorf("listed unit %d: %d %v, whole %d %v", k, u.Index, u.Score, w.Index, w.Score)
		}
	}
	for _, bad := range []Options{{Units: []int{1, 2, 1}}, {Part: 3, Parts: 3}, {Part: 0, Parts: 2, Units: []int{1}}} {
		if _, err := RunWith(ctx, d, m, bad); err == nil {
			t.Errorf("options %+v should be refused", bad)
		}
	}
}

// A study cut into several parts gets a candidate set that gives the same
// scores and slack sums as evaluating every unit against all units, and the
// pieces the page uses (FrontierParts, FrontierPart, FrontierCheck over an
// uneven split of the pool) give exactly the set Frontier gives. Duplicated
// units (ties that no block can break) are part of the data.
func TestFrontierInPartsMatchesFull(t *testing.T) {
	old := partSize
	partSize = 700
	defer func() { partSize = old }()
	d := cobbDouglas(2600, 3, 2, 5)
	for k := 0; k < 40; k++ { // copies of units, some on the frontier
		d.X = append(d.X, append([]float64(nil), d.X[k*7]...))
		d.Y = append(d.Y, append([]float64(nil), d.Y[k*7]...))
	}
	n := len(d.X)
	ctx := context.Background()
	parts := FrontierParts(d)
	if len(parts) < 3 {
		t.Fatalf("%d parts for %d units of at most %d", len(parts), n, partSize)
	}
	seen := make([]bool, n)
	var pool []int
	for _, p := range parts {
		for _, j := range p {
			if seen[j] {
				t.Fatalf("unit %d in two parts", j)
			}
			seen[j] = true
		}
		c, err := FrontierPart(ctx, d, p)
		if err != nil {
			t.Fatal(err)
		}
		pool = append(pool, c...)
	}
	for j, s := range seen {
		if !s {
			t.Fatalf("unit %d in no part", j)
		}
	}
	slices.Sort(pool)
	var pieced []int
	for _, cut := range [][2]int{{0, 5}, {5, len(pool) / 3}, {len(pool) / 3, len(pool)}} {
		kept, err := FrontierCheck(ctx, d, pool, pool[cut[0]:cut[1]])
		if err != nil {
			t.Fatal(err)
		}
		pieced = append(pieced, kept...)
	}
	for _, w := range []int{1, 2} {
		f, err := frontier(ctx, scaleData(d), w)
		if err != nil {
			t.Fatal(err)
		}
		if !slices.Equal(f, pieced) {
			t.Fatalf("%d workers: Frontier gives %d units, the pieces %d", w, len(f), len(pieced))
		}
	}
	all := make([]int, n)
	for j := range all {
		all[j] = j
	}
	m := Model{Returns: Variable, Orientation: Input, SecondStage: true}
	fast, err := RunWith(ctx, d, m, Options{Frontier: pieced})
	if err != nil {
		t.Fatal(err)
	}
	full, err := RunWith(ctx, d, m, Options{Frontier: all})
	if err != nil {
		t.Fatal(err)
	}
	for k := range fast.Units {
		a, b := fast.Units[k], full.Units[k]
		if math.Abs(a.Score-b.Score) > 1e-8 || math.Abs(slackSum(a)-slackSum(b)) > 1e-6*(1+slackSum(b)) || !a.Cert.Verified {
			t.Errorf("unit %d: score %v slack sum %v (verified %v) with the parts' candidates, %v and %v with all units", k, a.Score, slackSum(a), a.Cert.Verified, b.Score, slackSum(b))
		}
	}
	if _, err := FrontierCheck(ctx, d, pool, []int{n}); err == nil {
		t.Error("a unit index out of range should be refused")
	}
}
