package bench

import "peerlens/engine/dea"

// Floor does one pass of multiply-adds over units x frontier units x
// measures: for every unit o and every frontier unit j it forms
// sum_i x_o[i]*x_j[i] + sum_r y_o[r]*y_j[r] and keeps the largest. Its time
// is the yardstick for the engine (see the package comment). The frontier
// units are copied into one contiguous block first, as a careful
// implementation would; the result is returned so that no work can be
// optimised away.
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
	total := 0.0
	for u := range d.X {
		copy(o, d.X[u])
		copy(o[m:], d.Y[u])
		best := 0.0
		for c := 0; c+k <= len(f); c += k {
			col := f[c : c+k]
			t := 0.0
			for i, v := range col {
				t += v * o[i]
			}
			if t > best {
				best = t
			}
		}
		total += best
	}
	return total
}
