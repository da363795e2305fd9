package dea

import (
	"math"

	"peerlens/engine/internal/kernel"
)

// certTolerance bounds every violation of a verified certificate: each
// residual is measured relative to the size of the terms it is made of.
const certTolerance = 1e-7

// fullCheckLimit is the study size up to which the dual check of every
// certificate covers all units; above it, it covers the reference set, which
// is enough by the argument in Frontier's doc comment.
const fullCheckLimit = 2000

// certify checks a point's solution against the data, independently of the
// solver's own claims. It recomputes every constraint of the envelopment
// program from lambda, the slacks and the score (primal), every constraint of
// the multiplier program from the dual values (the weights must not put any
// unit of checkSet beyond the frontier), and the gap between the primal score
// and the dual objective.
func (e *envelope) certify(p *point, x0, y0 []float64, self int, cs checks) Certificate {
	sc := e.sc
	ms := sc.m + sc.s
	input := e.model.Orientation == Input
	cert := Certificate{Tolerance: certTolerance, Checked: cs.count(e)}
	viol := func(dst *float64, v float64) {
		if v > *dst || math.IsNaN(v) {
			*dst = v
		}
	}
	// Primal: lambda and slacks non-negative; the rows hold. Each row's
	// residual is measured against the size of the terms in it, so a row
	// whose terms are all tiny cannot pass by being tiny.
	sumX := make([]float64, sc.m)
	sumY := make([]float64, sc.s)
	absX := make([]float64, sc.m)
	absY := make([]float64, sc.s)
	sumL, absL := 0.0, 0.0
	add := func(j int, l float64) {
		for i := range sumX {
			sumX[i] += l * sc.x[j][i]
			absX[i] += math.Abs(l * sc.x[j][i])
		}
		for r := range sumY {
			sumY[r] += l * sc.y[j][r]
			absY[r] += math.Abs(l * sc.y[j][r])
		}
		sumL += l
		absL += math.Abs(l)
	}
	minL := 0.0
	for k, j := range e.ref {
		// Most lambdas of a large reference set are exactly zero.
		if l := p.lambda[k]; l != 0 {
			add(j, l)
			minL = math.Min(minL, l)
		}
	}
	if p.self != 0 && self >= 0 {
		add(self, p.self)
	}
	viol(&cert.PrimalError, -minL/math.Max(1, absL))
	viol(&cert.PrimalError, -p.self/math.Max(1, absL))
	// Each side's rows are also measured against the largest right-hand
	// side of that side (a normwise relative backward error), so rounding
	// noise in a row whose terms are all zero is not mistaken for a failure.
	inScale, outScale := 0.0, 0.0
	for i := 0; i < sc.m; i++ {
		inScale = math.Max(inScale, math.Abs(x0[i]*pick(input, p.score, 1)))
	}
	for r := 0; r < sc.s; r++ {
		outScale = math.Max(outScale, math.Abs(y0[r]*pick(!input, p.score, 1)))
	}
	for i := 0; i < sc.m; i++ {
		rhs := x0[i]
		if input {
			rhs = p.score * x0[i]
		}
		den := absX[i] + math.Abs(p.sIn[i]) + math.Abs(rhs) + inScale
		viol(&cert.PrimalError, relative(sumX[i]+p.sIn[i]-rhs, den, true))
		viol(&cert.PrimalError, relative(-p.sIn[i], den, false))
	}
	for r := 0; r < sc.s; r++ {
		rhs := y0[r]
		if !input {
			rhs = p.score * y0[r]
		}
		den := absY[r] + math.Abs(p.sOut[r]) + math.Abs(rhs) + outScale
		viol(&cert.PrimalError, relative(sumY[r]-p.sOut[r]-rhs, den, true))
		viol(&cert.PrimalError, relative(-p.sOut[r], den, false))
	}
	for _, r := range e.rr {
		den := absL + r.rhs
		switch r.sign {
		case 0:
			viol(&cert.PrimalError, relative(sumL-r.rhs, den, true))
		case 1:
			viol(&cert.PrimalError, relative(sumL-r.rhs, den, false))
		case -1:
			viol(&cert.PrimalError, relative(r.rhs-sumL, den, false))
		}
	}

	// Dual: v = -y(inputs) >= 0, u = y(outputs) >= 0, signs of the returns rows.
	y := p.y
	v := make([]float64, sc.m)
	u := make([]float64, sc.s)
	for i := range v {
		v[i] = -y[i]
		viol(&cert.DualError, -v[i])
	}
	for r := range u {
		u[r] = y[sc.m+r]
		viol(&cert.DualError, -u[r])
	}
	w, wObj := 0.0, 0.0
	for q, r := range e.rr {
		yc := y[ms+q]
		w += yc
		wObj += yc * r.rhs
		switch r.sign {
		case 1: // sum + slack = rhs: yc <= 0
			viol(&cert.DualError, yc)
		case -1: // sum - slack = rhs: yc >= 0
			viol(&cert.DualError, -yc)
		}
	}
	vx0, uy0 := dot(v, x0), dot(u, y0)
	var dualObj float64
	if input {
		viol(&cert.DualError, vx0-1) // theta column: 1 - v.x0 >= 0
		dualObj = uy0 + wObj
	} else {
		viol(&cert.DualError, 1-uy0) // phi column: -1 + u.y0 >= 0
		dualObj = vx0 - wObj
	}
	xs, ys := sc.xs, sc.ys
	check := func(j int) {
		xj := xs[j*sc.m : (j+1)*sc.m]
		yj := ys[j*sc.s : (j+1)*sc.s]
		uy, vx := 0.0, 0.0
		for r, a := range yj {
			uy += a * u[r]
		}
		for i, a := range xj {
			vx += a * v[i]
		}
		// Most units sit strictly inside the weights' frontier: only a
		// positive (or NaN) residual can be a violation.
		if d := uy - vx + w; !(d <= 0) {
			// Measured against the unit's own virtual input and output and
			// the free term, with a floor of 1e-6 of the normalisation
			// (v.x0 = 1 or u.y0 = 1).
			viol(&cert.DualError, relative(d, math.Abs(uy)+math.Abs(vx)+math.Abs(w)+1e-6, false))
		}
	}
	if cs.ref {
		// The reference units' lambda columns of the program are the
		// data (x_j, y_j, a 1 per returns row), one after the other, so
		// u.y_j - v.x_j + w for all of them is one pass of dot products
		// with the duals; the few that come out positive are measured as
		// above.
		K := len(e.ref)
		e.dots = grow(e.dots, K)
		kernel.Dots(e.dots, e.prob.A[e.rows:(1+K)*e.rows], y[:e.rows])
		for k, d := range e.dots {
			if !(d <= 0) {
				check(e.ref[k])
			}
		}
	}
	for _, j := range cs.units {
		check(j)
	}
	cert.Gap = relative(p.score-dualObj, math.Abs(p.score)+math.Abs(dualObj), true)
	cert.Verified = cert.PrimalError <= certTolerance && cert.DualError <= certTolerance && cert.Gap <= certTolerance
	return cert
}

// checks is the set of units the dual check of a certificate covers: every
// reference unit of the envelope when ref is set, and units.
type checks struct {
	ref   bool
	units []int
}

func (c checks) count(e *envelope) int {
	if c.ref {
		return len(e.ref) + len(c.units)
	}
	return len(c.units)
}

// certifyInfeasible checks a Farkas certificate y (y'a_j <= 0 for every
// allowed unit column and the score column, y'b > 0), which proves that no
// reference combination exists.
func (e *envelope) certifyInfeasible(y, x0, y0 []float64, checkSet []int) Certificate {
	sc := e.sc
	ms := sc.m + sc.s
	cert := Certificate{Tolerance: certTolerance, Checked: len(checkSet)}
	colDot := func(x, yy []float64) float64 {
		t := dot(y[:sc.m], x) + dot(y[sc.m:ms], yy)
		for q := range e.rr {
			t += y[ms+q]
		}
		return t
	}
	for _, j := range checkSet {
		if d := colDot(sc.x[j], sc.y[j]); d > cert.DualError {
			cert.DualError = d
		}
	}
	// Slack columns: +e_i for inputs, -e_r for outputs, sign for returns rows.
	for i := 0; i < sc.m; i++ {
		cert.DualError = math.Max(cert.DualError, y[i])
	}
	for r := 0; r < sc.s; r++ {
		cert.DualError = math.Max(cert.DualError, -y[sc.m+r])
	}
	for q, r := range e.rr {
		if r.sign != 0 {
			cert.DualError = math.Max(cert.DualError, r.sign*y[ms+q])
		}
	}
	// Score column and right-hand side.
	var score, yb float64
	if e.model.Orientation == Input {
		score = -dot(y[:sc.m], x0)
		yb = dot(y[sc.m:ms], y0)
	} else {
		score = -dot(y[sc.m:ms], y0)
		yb = dot(y[:sc.m], x0)
	}
	cert.DualError = math.Max(cert.DualError, score)
	for q, r := range e.rr {
		yb += y[ms+q] * r.rhs
	}
	// y'b must be clearly positive relative to the violations.
	cert.Gap = yb
	cert.Verified = yb > 0 && cert.DualError <= certTolerance*math.Max(1, yb)
	return cert
}

// relative is v measured against the size den of the terms it came from
// (absolute: |v|; otherwise v itself, so that negative values are no
// violation); 0 when there is nothing to measure.
func pick(cond bool, a, b float64) float64 {
	if cond {
		return a
	}
	return b
}

func relative(v, den float64, absolute bool) float64 {
	if absolute {
		v = math.Abs(v)
	}
	if den == 0 || v <= 0 {
		return math.Max(v, 0)
	}
	return v / den
}

func dot(a, b []float64) float64 {
	t := 0.0
	for i := range a {
		t += a[i] * b[i]
	}
	return t
}

// certifyNoExpansion checks the claim phi = 0 in output orientation (no
// combination of the reference units within the unit's inputs produces any
// of its outputs): the dual solution must be feasible and its objective,
// an upper bound on phi, zero within the tolerance. It makes no primal
// claim, so PrimalError is left at zero.
func (e *envelope) certifyNoExpansion(p *point, x0, y0 []float64, checkSet []int) Certificate {
	c := e.certify(p, x0, y0, -1, checks{units: checkSet})
	sc := e.sc
	bound := -dot(p.y[:sc.m], x0) // v.x0
	for q, r := range e.rr {
		bound -= p.y[sc.m+sc.s+q] * r.rhs
	}
	c.PrimalError = 0
	c.Gap = math.Max(bound, 0)
	c.Verified = c.DualError <= certTolerance && c.Gap <= certTolerance
	return c
}
