package dea

import (
	"context"
	"math/rand/v2"
	"slices"
)

// blockSize is the number of units evaluated together when the candidate set
// is built; studies no larger than this are solved against all units.
const blockSize = 256

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
// of the block dominates, so they all score 1 and stay. Rounds repeat with
// freshly shuffled blocks; when a round thins the set out by less than a
// tenth the blocks grow fourfold, and the last round evaluates every
// remaining candidate against all of them.
//
// Screening needs only to know whether a score is below 1, so each program
// stops as soon as a combination proves it is (lp.Options.Cutoff).
//
// Super-efficiency leaves the unit out of its own reference set, which can
// break this argument for units of C, so it is solved with column generation
// over all units instead (see Run).
func Frontier(ctx context.Context, d *Data) ([]int, error) {
	sc := scaleData(d)
	return frontier(ctx, sc)
}

func frontier(ctx context.Context, sc *scaled) ([]int, error) {
	all := make([]int, sc.n)
	for j := range all {
		all[j] = j
	}
	if sc.n <= 2*blockSize {
		return all, nil
	}
	m := Model{Returns: Variable, Orientation: Input}
	rng := rand.New(rand.NewPCG(uint64(sc.n), 0x9e3779b97f4a7c15))
	cand := all
	for size := blockSize; ; {
		rng.Shuffle(len(cand), func(a, b int) { cand[a], cand[b] = cand[b], cand[a] })
		nb := (len(cand) + size - 1) / size
		if len(cand) <= 2*size {
			nb = 1 // the last round: every candidate against all of them
		}
		var next []int
		for b := 0; b < nb; b++ {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
			lo, hi := b*len(cand)/nb, (b+1)*len(cand)/nb
			block := append([]int(nil), cand[lo:hi]...)
			env := newEnvelope(sc, block, m)
			env.cutoff = keepAbove
			for _, j := range block {
				p, err := env.solve(sc.x[j], sc.y[j], j, false, false)
				if err != nil || p.score > keepAbove {
					next = append(next, j) // keep on any doubt
				}
			}
		}
		shrunk := len(cand) - len(next)
		cand = next
		if nb == 1 {
			break
		}
		if shrunk*10 < len(cand) {
			size *= 4 // blocks of this size no longer thin the set out
		}
	}
	slices.Sort(cand)
	return cand, nil
}
