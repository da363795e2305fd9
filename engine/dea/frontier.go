package dea

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"sync"
)

// blockSize is the number of units evaluated together when the candidate set
// is built; studies no larger than twice this are solved against all units.
const blockSize = 256

// partSize is the largest number of units one part of the candidate search
// covers. Parts are independent, so they can be searched at the same time
// (goroutines natively, Web Workers in the page); how units are cut into
// parts depends on the data alone, never on the number of workers, so the
// candidate set is the same however many workers find it. (A variable only
// so that tests can cut small studies into parts.)
var partSize = 16384

// Mid-sized studies are cut into up to busyParts parts of at least
// minPart units, so that several workers share the search (measured on the
// benchmark's studies: parts of 2,048 to 16,384 units cost the same on one
// worker within a few per cent at 10,000 and 40,000 units).
const (
	busyParts = 8
	minPart   = 2500
)

// partCount is the number of parts of a study of n units.
func partCount(n int) int {
	return max(1, (n+partSize-1)/partSize, min(busyParts, n/minPart))
}

// localRounds is the number of rounds whose blocks are stretches of similar
// units (see evalOrder) rather than random draws: similar units are the ones
// likely to dominate each other, so these rounds thin the set out most.
const localRounds = 2

// keepAbove is the block score above which a unit stays a candidate. It is
// deliberately loose: keeping a unit that is in fact inefficient costs a
// little time; dropping an efficient one would change results.
const keepAbove = 1 - 1e-6

// Frontier returns a set C of units that contains every extreme-efficient
// unit of d, found without solving any unit against the whole sample.
//
// Why evaluating against C gives the same answers as evaluating against all
// units: a unit j is left out of C only when, inside some block B, its
// variable-returns input score is below 1, that is when a convex combination
// of units of B uses no more of every input and makes at least as much of
// every output (x_j >= sum mu_k x_k, y_j <= sum mu_k y_k, sum mu = 1). The
// units of B that are themselves left out are in turn dominated the same way
// by later candidates, so every unit of the data is dominated by a convex
// combination of C. Any envelopment solution that uses such a unit can
// therefore swap it for that combination: the sum of lambdas is unchanged
// (so every returns-to-scale rule still holds), inputs used can only fall and
// outputs can only rise, so the slacks can only grow. Hence the technology
// spanned by C equals the one spanned by all units, and the radial score, the
// maximal slack sum and the targets are the same. Only the choice among
// several optimal combinations (the peers, when they are not unique) can
// differ, always in favour of units in C.
//
// Units dropped together from one block are also safe: the block's
// technology is spanned by its extreme points, which no convex combination
// of the block dominates, so they all score 1 and stay. The same holds for
// parts (FrontierParts): each part keeps its own extreme points, and the
// extreme points of all units are among them; a last check of every
// remaining candidate against all of them (FrontierCheck, which may be split
// over workers by the units checked) keeps the union's extreme points.
//
// Within a part, rounds repeat: the first ones over stretches of similar
// units, later ones over freshly shuffled blocks; when a round thins the set
// out by less than a tenth the blocks grow fourfold, and the part's last
// round evaluates every remaining candidate against all of them.
//
// Screening needs only to know whether a score is below 1, so each program
// stops as soon as a combination proves it is (lp.Options.Cutoff), and a
// unit is dropped only when that combination, checked row by row against
// the unit's own values, holds (dominated).
//
// Super-efficiency leaves the unit out of its own reference set, which can
// break this argument for units of C, so it is solved with column generation
// over all units instead (see Run).
func Frontier(ctx context.Context, d *Data) ([]int, error) {
	return frontier(ctx, scaleData(d), runtime.GOMAXPROCS(0))
}

// FrontierParts cuts the units of d into the parts the candidate search
// works on: stretches of an order that puts similar units together.
func FrontierParts(d *Data) [][]int {
	return parts(scaleData(d))
}

// FrontierPart returns the candidates of one part of FrontierParts: the
// units of part that no convex combination of units of part dominates, and
// possibly a few more.
func FrontierPart(ctx context.Context, d *Data, part []int) ([]int, error) {
	sc := scaleData(d)
	if err := checkIndices(sc, part); err != nil {
		return nil, err
	}
	return searchPart(ctx, sc, part)
}

// FrontierCheck returns the units of check that stay candidates when
// evaluated against all of pool (check is a subset of pool; pool is the
// union of the parts' candidates). Splitting pool into several checks and
// joining the answers gives the same set as one check of all of pool.
func FrontierCheck(ctx context.Context, d *Data, pool, check []int) ([]int, error) {
	sc := scaleData(d)
	if err := checkIndices(sc, pool); err != nil {
		return nil, err
	}
	if err := checkIndices(sc, check); err != nil {
		return nil, err
	}
	return screen(ctx, sc, pool, check)
}

func checkIndices(sc *scaled, units []int) error {
	for _, j := range units {
		if j < 0 || j >= sc.n {
			return fmt.Errorf("dea: unit index %d out of range", j)
		}
	}
	return nil
}

// frontierModel is the model of every screening program.
var frontierModel = Model{Returns: Variable, Orientation: Input}

func parts(sc *scaled) [][]int {
	all := make([]int, sc.n)
	for j := range all {
		all[j] = j
	}
	if sc.n <= 2*blockSize {
		return [][]int{all}
	}
	order := evalOrder(sc, frontierModel, all)
	for k, q := range order {
		order[k] = all[q]
	}
	np := partCount(sc.n)
	out := make([][]int, np)
	for p := range out {
		lo, hi := p*sc.n/np, (p+1)*sc.n/np
		out[p] = order[lo:hi:hi]
	}
	return out
}

// frontier runs the whole search with up to workers goroutines.
func frontier(ctx context.Context, sc *scaled, workers int) ([]int, error) {
	ps := parts(sc)
	found := make([][]int, len(ps))
	if err := parallel(ctx, len(ps), workers, func(p int) error {
		var err error
		found[p], err = searchPart(ctx, sc, ps[p])
		return err
	}); err != nil {
		return nil, err
	}
	var pool []int
	for _, f := range found {
		pool = append(pool, f...)
	}
	slices.Sort(pool)
	if len(ps) == 1 {
		return pool, nil
	}
	// The last check, split into pieces over the workers.
	pieces := max(1, min(workers, len(pool)/blockSize))
	kept := make([][]int, pieces)
	if err := parallel(ctx, pieces, workers, func(k int) error {
		lo, hi := k*len(pool)/pieces, (k+1)*len(pool)/pieces
		var err error
		kept[k], err = screen(ctx, sc, pool, pool[lo:hi])
		return err
	}); err != nil {
		return nil, err
	}
	var out []int
	for _, k := range kept {
		out = append(out, k...)
	}
	return out, nil
}

// parallel runs f(0..n-1) on up to workers goroutines and returns the first
// error.
func parallel(ctx context.Context, n, workers int, f func(int) error) error {
	var (
		mu       sync.Mutex
		next     int
		firstErr error
		wg       sync.WaitGroup
	)
	work := func() {
		defer wg.Done()
		for {
			mu.Lock()
			k := next
			next++
			stop := firstErr != nil
			mu.Unlock()
			if k >= n || stop {
				return
			}
			if err := f(k); err != nil {
				mu.Lock()
				if firstErr == nil {
					firstErr = err
				}
				mu.Unlock()
				return
			}
		}
	}
	workers = max(1, min(workers, n))
	wg.Add(workers)
	for w := 1; w < workers; w++ {
		go work()
	}
	work()
	wg.Wait()
	if firstErr == nil {
		firstErr = ctx.Err()
	}
	return firstErr
}

// searchPart runs the rounds of the search over one part (given in the
// order of evalOrder) and returns its candidates in increasing order.
func searchPart(ctx context.Context, sc *scaled, part []int) ([]int, error) {
	cand := append([]int(nil), part...)
	if len(cand) <= 2*blockSize {
		slices.Sort(cand)
		return cand, nil
	}
	seed := uint64(len(part))<<32 ^ uint64(part[0])
	rng := rand.New(rand.NewPCG(seed, 0x9e3779b97f4a7c15))
	for size, round := blockSize, 0; ; round++ {
		switch {
		case round >= localRounds:
			rng.Shuffle(len(cand), func(a, b int) { cand[a], cand[b] = cand[b], cand[a] })
		case round > 0:
			// Similar units again, among the survivors.
			ord := evalOrder(sc, frontierModel, cand)
			next := make([]int, len(cand))
			for k, q := range ord {
				next[k] = cand[q]
			}
			cand = next
		}
		if len(cand) <= 2*size {
			// The last round: every candidate against all of them, in a
			// shuffled column order (partial pricing works best when the
			// columns it scans first are varied).
			if round < localRounds {
				rng.Shuffle(len(cand), func(a, b int) { cand[a], cand[b] = cand[b], cand[a] })
			}
			next, err := screen(ctx, sc, cand, cand)
			if err != nil {
				return nil, err
			}
			slices.Sort(next)
			return next, nil
		}
		nb := (len(cand) + size - 1) / size
		var next []int
		for b := 0; b < nb; b++ {
			lo, hi := b*len(cand)/nb, (b+1)*len(cand)/nb
			block := append([]int(nil), cand[lo:hi]...)
			kept, err := screen(ctx, sc, block, block)
			if err != nil {
				return nil, err
			}
			next = append(next, kept...)
		}
		shrunk := len(cand) - len(next)
		cand = next
		if shrunk*10 < len(cand) {
			size *= 4 // blocks of this size no longer thin the set out
		}
	}
}

// screen evaluates the units of check against the units of ref and returns
// those whose score is not proven below 1, in the order of check.
func screen(ctx context.Context, sc *scaled, ref, check []int) ([]int, error) {
	env := newEnvelope(sc, ref, frontierModel)
	env.cutoff = keepAbove
	env.noRestrict = true // screening programs end early: plain pricing is faster
	var kept []int
	in, out := make([]float64, sc.m), make([]float64, sc.s)
	for k, j := range check {
		if k%64 == 0 {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
		}
		p, err := env.solve(sc.x[j], sc.y[j], j, false, false)
		if err != nil || p.score > keepAbove || !dominated(sc, ref, p, j, in, out) {
			kept = append(kept, j) // keep on any doubt
		}
	}
	return kept, nil
}

// dominated checks, row by row against the unit's own values, that the
// combination a screening program found really uses less of every input
// than unit j (at most keepAbove times as much) and makes at least as much
// of every output, with lambdas summing to 1. The solver's tolerances are
// absolute and the data scaled by each measure's mean, so on a measure
// whose values span many orders of magnitude its answer can be off for a
// unit that is small on that measure; a unit is dropped only on a
// combination that holds. in and out are buffers of one value per input and
// output.
func dominated(sc *scaled, ref []int, p *point, j int, in, out []float64) bool {
	const tol = 1e-9
	clear(in)
	clear(out)
	sum := 0.0
	for _, c := range p.basis { // only basic lambdas can be nonzero
		k := c - 1
		if k < 0 || k >= len(ref) {
			continue
		}
		l := p.lambda[k]
		if l == 0 {
			continue
		}
		if l < 0 {
			return false
		}
		u := ref[k]
		for i, v := range sc.x[u] {
			in[i] += l * v
		}
		for r, v := range sc.y[u] {
			out[r] += l * v
		}
		sum += l
	}
	if p.self != 0 || math.Abs(sum-1) > tol {
		return false
	}
	for i, v := range sc.x[j] {
		if in[i] > keepAbove*v*(1+tol) {
			return false
		}
	}
	for r, v := range sc.y[j] {
		if out[r] < v*(1-tol) {
			return false
		}
	}
	return true
}
