package lp

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
)

// invertSmall agrees with gonum's Getrf and Getri (the same method) to
// rounding, and A times its inverse is the identity, on random matrices,
// matrices that need row exchanges, and badly scaled ones; a singular
// matrix is refused.
func TestInvertSmallAgreesWithLapack(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	for m := 1; m <= smallBasis; m++ {
		for trial := 0; trial < 20; trial++ {
			a := make([]float64, m*m)
			for i := range a {
				a[i] = r.NormFloat64()
				if trial%4 == 1 {
					a[i] *= math.Pow(10, float64(r.IntN(9)-4)) // badly scaled
				}
			}
			if trial%4 == 2 {
				for i := 0; i < m; i++ {
					a[i*m+i] = 0 // zero diagonal: row exchanges needed
				}
			}
			orig := append([]float64(nil), a...)
			want := append([]float64(nil), a...)
			ipiv := make([]int, m)
			g := blas64.General{Rows: m, Cols: m, Stride: m, Data: want}
			work := make([]float64, 4*m*m)
			if !lapack64.Getrf(g, ipiv) || !lapack64.Getri(g, ipiv, work, len(work)) {
				continue // singular by chance
			}
			if !invertSmall(a, make([]float64, m+m*m), make([]int, m), m) {
				t.Fatalf("m=%d trial %d: refused a matrix LAPACK inverts", m, trial)
			}
			scale := 0.0
			for _, v := range want {
				scale = math.Max(scale, math.Abs(v))
			}
			for i := range a {
				if math.Abs(a[i]-want[i]) > 1e-9*scale {
					t.Fatalf("m=%d trial %d entry %d: %v, LAPACK %v", m, trial, i, a[i], want[i])
				}
			}
			for i := 0; i < m; i++ {
				for j := 0; j < m; j++ {
					s, size := 0.0, 0.0
					for k := 0; k < m; k++ {
						s += orig[i*m+k] * a[k*m+j]
						size += math.Abs(orig[i*m+k] * a[k*m+j])
					}
					if i == j {
						s--
					}
					if math.Abs(s) > 1e-12*math.Max(1, size) {
						t.Fatalf("m=%d trial %d: (A A^-1 - I)[%d,%d] = %g", m, trial, i, j, s)
					}
				}
			}
		}
	}
	sing := []float64{1, 2, 2, 4}
	if invertSmall(sing, make([]float64, 6), make([]int, 2), 2) {
		t.Error("a singular matrix was inverted")
	}
}
