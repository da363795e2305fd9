package kernel

import (
	"math/rand/v2"
	"testing"
)

// Dots gives, bit for bit, what the plain loop over the rows gives, for
// every column length with its own loop and beyond.
func TestDotsMatchesPlainLoop(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for m := 0; m <= maxRowsTested; m++ {
		for _, n := range []int{0, 1, 7, 100} {
			cols := make([]float64, n*m+3) // longer than needed: the rest is ignored
			for i := range cols {
				cols[i] = r.NormFloat64() * 1e3
			}
			y := make([]float64, m)
			for i := range y {
				y[i] = r.NormFloat64()
			}
			dst := make([]float64, n)
			for k := range dst {
				dst[k] = 42 // must be overwritten
			}
			Dots(dst, cols, y)
			for k := 0; k < n; k++ {
				want := 0.0
				for i := 0; i < m; i++ {
					want += cols[k*m+i] * y[i]
				}
				if dst[k] != want {
					t.Fatalf("m=%d n=%d column %d: %v, plain loop %v", m, n, k, dst[k], want)
				}
			}
		}
	}
}

const maxRowsTested = 15

func BenchmarkDots6(b *testing.B) {
	n := 8000
	cols := make([]float64, 6*n)
	for i := range cols {
		cols[i] = float64(i%7) + 0.5
	}
	y := []float64{-0.3, -0.2, -0.1, 0.4, 0.5, 0.6}
	dst := make([]float64, n)
	for b.Loop() {
		Dots(dst, cols, y)
	}
}
