package dea

import (
	"errors"
	"fmt"
	"math"
)

// super computes the super-efficiency score of unit o (Andersen & Petersen
// 1993, Management Science 39(10) 1261-1264): the same radial program with
// the unit left out of its own reference set, so efficient units can score
// above 1 (input orientation: theta > 1; output orientation: 1/phi > 1) and
// be ranked. Under variable, non-decreasing or bounded returns the program
// can be infeasible (Seiford & Zhu 1999, JORS 50 1264-1273): then Super is
// nil and SuperNote says why; no number is invented.
//
// For an inefficient unit under constant, variable, non-increasing or
// non-decreasing returns the score does not change when the unit is left
// out: if an optimal combination used the unit itself with weight l < 1,
// dividing the rest of the combination by (1 - l) gives a combination without
// it whose score is no worse and whose sum of lambdas still meets the rule.
// Those units get Super = Score. Under bounded returns the rescaled sum can
// leave the bounds, so every unit is solved.
//
// Leaving a unit out can expose units that the candidate set of Frontier
// dropped because the unit dominated them. So the program is solved by column
// generation: against the candidates first, then every unit whose column
// prices out (its reduced cost under the current duals, or under the Farkas
// certificate when the program is infeasible, shows it would help) joins,
// until none does. The last pricing pass is a dual check over all units.
func (ev *evaluator) super(u *UnitResult, o int) {
	m := ev.m
	if u.Status == NotSolved {
		return
	}
	if u.Score < 1-scoreTol && m.Returns != Bounded {
		s := u.Score
		u.Super = &s
		return
	}
	radial := Model{Returns: m.Returns, Lower: m.Lower, Upper: m.Upper, Orientation: m.Orientation}
	sc := ev.sc
	work := make([]int, 0, len(ev.cand))
	for _, j := range ev.cand {
		if j != o {
			work = append(work, j)
		}
	}
	inWork := make([]bool, sc.n)
	for _, j := range work {
		inWork[j] = true
	}
	others := make([]int, 0, sc.n-1)
	for j := 0; j < sc.n; j++ {
		if j != o {
			others = append(others, j)
		}
	}
	x0, y0 := sc.x[o], sc.y[o]
	for round := 0; ; round++ {
		e := newEnvelope(sc, work, radial)
		p, err := e.solve(x0, y0, o, true, false)
		if err != nil && !errors.Is(err, ErrNoFiniteScore) {
			u.SuperNote = "the super-efficiency program could not be solved reliably: " + err.Error()
			return
		}
		added := ev.price(e, p.y, inWork, o, &work)
		if added > 0 && round < 1000 {
			continue
		}
		if err != nil {
			cert := e.certifyInfeasible(p.y, x0, y0, others)
			u.SuperCert = &cert
			u.SuperNote = superInfeasibleNote(m)
			return
		}
		if m.Orientation == Output && p.score <= scoreTol {
			cert := e.certifyNoExpansion(p, x0, y0, others)
			u.SuperCert = &cert
			// phi = 0: the other units can stay within the unit's inputs only
			// by producing nothing, so 1/phi has no finite value.
			u.SuperNote = fmt.Sprintf("no finite super-efficiency score: without this unit, no combination of the other units that stays within its inputs produces any of its outputs under %s returns to scale; the unit is efficient and sits at an edge of the data", m.Returns)
			return
		}
		cert := e.certify(p, x0, y0, -1, checks{units: others})
		u.SuperCert = &cert
		s := scoreOf(radial, p.score)
		u.Super = &s
		return
	}
}

// price adds to work every unit (other than o) whose lambda column has a
// negative reduced cost under duals y, and returns how many it added.
func (ev *evaluator) price(e *envelope, y []float64, inWork []bool, o int, work *[]int) int {
	sc := ev.sc
	ms := sc.m + sc.s
	w := 0.0
	for q := range e.rr {
		w += y[ms+q]
	}
	added := 0
	for j := 0; j < sc.n; j++ {
		if j == o || inWork[j] {
			continue
		}
		// Reduced cost of lambda_j: 0 - a_j'y.
		if d := -(dot(y[:sc.m], sc.x[j]) + dot(y[sc.m:ms], sc.y[j]) + w); d < -1e-9 {
			inWork[j] = true
			*work = append(*work, j)
			added++
		}
	}
	return added
}

func superInfeasibleNote(m Model) string {
	what := "produce this unit's outputs"
	if m.Orientation == Output {
		what = "stay within this unit's inputs"
	}
	return fmt.Sprintf("no finite super-efficiency score: without this unit, no combination of the other units can %s under %s returns to scale (Seiford & Zhu 1999); the unit is efficient and sits at an edge of the data", what, m.Returns)
}

// PointResult is the evaluation of one point against a reference set.
type PointResult struct {
	Score       float64     `json:"score"`     // theta, or 1/phi
	Expansion   float64     `json:"expansion"` // phi (output orientation)
	Peers       []Peer      `json:"peers"`
	InputSlack  []float64   `json:"inputSlack"`
	OutputSlack []float64   `json:"outputSlack"`
	InputW      []float64   `json:"inputWeights"`
	OutputW     []float64   `json:"outputWeights"`
	Free        float64     `json:"free"`
	Cert        Certificate `json:"certificate"`
}

// Evaluate measures the point with inputs x and outputs y against the
// technology spanned by the units ref of d (all units when ref is nil),
// under model m (Super and ScaleDetail are ignored). The point need not be a
// unit of d: period-to-period comparisons, bootstrap and leave-one-out all
// use this. Data are scaled by d's measure means. When no combination of the
// reference units can cover the point, the error is ErrNoFiniteScore.
func Evaluate(d *Data, ref []int, x, y []float64, m Model) (*PointResult, error) {
	if err := m.Validate(); err != nil {
		return nil, err
	}
	if err := CheckData(d); err != nil {
		return nil, err
	}
	sc := scaleData(d)
	if len(x) != sc.m || len(y) != sc.s {
		return nil, fmt.Errorf("dea: point has %d inputs and %d outputs, data have %d and %d", len(x), len(y), sc.m, sc.s)
	}
	for _, v := range append(append([]float64(nil), x...), y...) {
		if err := checkValue(v); err != nil {
			return nil, fmt.Errorf("dea: point: %w", err)
		}
	}
	if ref == nil {
		ref = make([]int, sc.n)
		for j := range ref {
			ref[j] = j
		}
	}
	for _, j := range ref {
		if j < 0 || j >= sc.n {
			return nil, fmt.Errorf("dea: reference unit %d out of range", j)
		}
	}
	x0, y0 := divide(x, sc.mx), divide(y, sc.my)
	e := newEnvelope(sc, ref, m)
	p, err := e.solve(x0, y0, -1, false, m.SecondStage)
	if err != nil {
		return nil, err
	}
	if m.Orientation == Output && p.score <= scoreTol {
		return nil, fmt.Errorf("%w: the reference units can stay within the point's inputs only by producing nothing", ErrNoFiniteScore)
	}
	r := &PointResult{Score: scoreOf(m, p.score), Peers: []Peer{}}
	if m.Orientation == Output {
		r.Expansion = p.score
	}
	for k, j := range ref {
		if p.lambda[k] > lambdaTol {
			r.Peers = append(r.Peers, Peer{Index: j, Name: unitName(d, j), Lambda: p.lambda[k]})
		}
	}
	r.InputSlack = make([]float64, sc.m)
	r.InputW = make([]float64, sc.m)
	for i := range r.InputSlack {
		r.InputSlack[i] = math.Max(p.sIn[i], 0) * sc.mx[i]
		r.InputW[i] = -p.y[i] / sc.mx[i]
	}
	r.OutputSlack = make([]float64, sc.s)
	r.OutputW = make([]float64, sc.s)
	for k := range r.OutputSlack {
		r.OutputSlack[k] = math.Max(p.sOut[k], 0) * sc.my[k]
		r.OutputW[k] = p.y[sc.m+k] / sc.my[k]
	}
	for q := range e.rr {
		r.Free += p.y[sc.m+sc.s+q]
	}
	r.Cert = e.certify(p, x0, y0, -1, checks{ref: true})
	return r, nil
}
