package lp

// smallBasis is the largest basis inverted by invertSmall. DEA programs have
// one row per measure and one or two more, so nearly all of them qualify;
// for such sizes the general LAPACK routines spend more time in calls than
// in arithmetic (most of all as WebAssembly).
const smallBasis = 16

// invertSmall replaces the m x m row-major matrix a by its inverse, using
// the method of LAPACK's Getrf and Getri for one block: an LU factorisation
// with partial pivoting (PA = LU), then A^-1 = U^-1 L^-1 P, column by column
// of the identity. work holds at least m+m*m values and piv m entries. It reports false
// when a pivot is zero (a singular matrix).
func invertSmall(a, work []float64, piv []int, m int) bool {
	for k := 0; k < m; k++ {
		p, best := k, abs(a[k*m+k])
		for i := k + 1; i < m; i++ {
			if v := abs(a[i*m+k]); v > best {
				p, best = i, v
			}
		}
		if best == 0 {
			return false
		}
		piv[k] = p
		if p != k {
			rk, rp := a[k*m:(k+1)*m], a[p*m:(p+1)*m]
			for j := range rk {
				rk[j], rp[j] = rp[j], rk[j]
			}
		}
		rk := a[k*m : (k+1)*m]
		d := rk[k]
		for i := k + 1; i < m; i++ {
			ri := a[i*m : (i+1)*m]
			l := ri[k] / d
			ri[k] = l
			if l == 0 {
				continue
			}
			for j := k + 1; j < m; j++ {
				ri[j] -= l * rk[j]
			}
		}
	}
	// Column c of the inverse solves L U x = P e_c.
	x := work[:m]
	for c := 0; c < m; c++ {
		clear(x)
		x[c] = 1
		for k := 0; k < m; k++ {
			if p := piv[k]; p != k {
				x[k], x[p] = x[p], x[k]
			}
		}
		for i := 1; i < m; i++ { // L has a unit diagonal
			t := x[i]
			for j := 0; j < i; j++ {
				t -= a[i*m+j] * x[j]
			}
			x[i] = t
		}
		for i := m - 1; i >= 0; i-- {
			t := x[i]
			for j := i + 1; j < m; j++ {
				t -= a[i*m+j] * x[j]
			}
			x[i] = t / a[i*m+i]
		}
		for i := 0; i < m; i++ {
			work[m+i*m+c] = x[i]
		}
	}
	copy(a, work[m:m+m*m])
	return true
}

func abs(v float64) float64 {
	if v < 0 {
		return -v
	}
	return v
}
