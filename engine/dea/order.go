package dea

import (
	"math"
	"slices"
)

// evalOrder returns the positions 0..len(units)-1 in an order that puts
// units with similar data next to each other: a Z-order (Morton) curve over
// the ranks of a few features of each unit. Units next to each other in this
// order tend to be projected onto the same part of the frontier, so the
// columns and basis that solved one are a good start for the next. The order
// changes only speed, never results.
func evalOrder(sc *scaled, m Model, units []int) []int {
	n := len(units)
	order := make([]int, n)
	for k := range order {
		order[k] = k
	}
	if n < 64 {
		return order
	}
	// Features: the direction of the side the score scales (its shares of
	// the side's sum) and the logarithm of the other side.
	feat := func(j int, out []float64) []float64 {
		out = out[:0]
		dir, lvl := sc.x[j], sc.y[j]
		if m.Orientation == Output {
			dir, lvl = lvl, dir
		}
		sum := 0.0
		for _, v := range dir {
			sum += v
		}
		for i := 0; i+1 < len(dir); i++ {
			out = append(out, dir[i]/math.Max(sum, 1e-300))
		}
		for _, v := range lvl {
			out = append(out, math.Log(math.Max(v, 1e-300)))
		}
		return out
	}
	d := len(feat(units[0], nil))
	if d == 0 {
		return order
	}
	d = min(d, 16)
	bits := 64 / d
	if bits > 16 {
		bits = 16
	}
	vals := make([]float64, n*d)
	var buf []float64
	for k, j := range units {
		buf = feat(j, buf)
		copy(vals[k*d:(k+1)*d], buf[:d])
	}
	// Ranks per feature, quantised to bits bits.
	rank := make([]uint64, n*d)
	idx := make([]int, n)
	for f := 0; f < d; f++ {
		for k := range idx {
			idx[k] = k
		}
		slices.SortFunc(idx, func(a, b int) int {
			va, vb := vals[a*d+f], vals[b*d+f]
			switch {
			case va < vb:
				return -1
			case va > vb:
				return 1
			}
			return 0
		})
		for r, k := range idx {
			rank[k*d+f] = uint64(r) * (1 << bits) / uint64(n)
		}
	}
	key := make([]uint64, n)
	for k := range key {
		var z uint64
		for b := bits - 1; b >= 0; b-- {
			for f := 0; f < d; f++ {
				z = z<<1 | (rank[k*d+f]>>b)&1
			}
		}
		key[k] = z
	}
	slices.SortStableFunc(order, func(a, b int) int {
		switch {
		case key[a] < key[b]:
			return -1
		case key[a] > key[b]:
			return 1
		}
		return 0
	})
	return order
}

// chunkSize is the number of units evaluated one after the other, each
// starting with the columns that served the ones before (envelope.pool).
const chunkSize = 128

// task is one unit to evaluate and the place of its result.
type task struct{ unit, slot int }

// runPlan is the work of a run: chunks of units in evalOrder, each chunk
// evaluated in one go by one worker.
type runPlan struct {
	chunks [][]task
	count  int
}

// planRun lays out the work of RunWith. Chunks are stretches of the order
// of all units of the data, so a unit's chunk, and the units evaluated
// before it in that chunk, are the same whether the run covers all units,
// a part (Options.Parts) or any list of units that is a union of chunks.
func planRun(sc *scaled, m Model, opt Options) runPlan {
	all := make([]int, sc.n)
	for j := range all {
		all[j] = j
	}
	order := evalOrder(sc, m, all) // all[q] == q: positions are units
	slot := make([]int, sc.n)      // result place + 1 of each unit (0: not evaluated)
	count := 0
	switch {
	case opt.Units != nil:
		for k, j := range opt.Units {
			slot[j] = k + 1
		}
		count = len(opt.Units)
	case opt.Parts > 1:
		for pos, j := range order {
			if (pos/chunkSize)%opt.Parts == opt.Part {
				slot[j] = -1
			}
		}
		for j := range slot {
			if slot[j] == -1 {
				count++
				slot[j] = count
			}
		}
	default:
		for j := range slot {
			slot[j] = j + 1
		}
		count = sc.n
	}
	var p runPlan
	p.count = count
	var cur []task
	for pos, j := range order {
		if pos%chunkSize == 0 && len(cur) > 0 {
			p.chunks = append(p.chunks, cur)
			cur = nil
		}
		if slot[j] > 0 {
			cur = append(cur, task{unit: j, slot: slot[j] - 1})
		}
	}
	if len(cur) > 0 {
		p.chunks = append(p.chunks, cur)
	}
	return p
}
