package bench

import (
	"peerlens/engine/dea"
	"peerlens/engine/internal/kernel"
)

// Floor does one pass of multiply-adds over units x frontier units x
// measures: for every unit o and every frontier unit j it forms
// sum_i x_o[i]*x_j[i] + sum_r y_o[r]*y_j[r] and keeps the largest. Its time
// is the yardstick for the engine (see the package comment). The frontier
// units are copied into one contiguous block first, and the products use
// the engine's own fastest loop (kernel.Dots), as a careful implementation
// would; the result is returned so that no work can be optimised away.
func Floor(d *dea.Data, frontier []int) float64 {
	if len(d.X) == 0 || len(frontier) == 0 {
		return 0
	}
	m, s := len(d.X[0]), len(d.Y[0])
	k := m + s
	f := make([]float64, 0, len(frontier)*k)
	for _, j := range frontier {
		f = append(f, d.X[j]...)
		f = append(f, d.Y[j]...)
	}
	o := make([]float64, k)
	dots := make([]float64, len(frontier))
	total := 0.0
	for u := range d.X {
		copy(o, d.X[u])
		copy(o[m:], d.Y[u])
		kernel.Dots(dots, f, o)
		best := 0.0
		for _, t := range dots {
			if t > best {
				best = t
			}
		}
		total += best
	}
	return total
}
