package dea

import "fmt"

// Returns is the returns-to-scale assumption of the reference technology: it
// bounds the sum of the lambdas (the weights of the convex or conical
// combination of units).
type Returns string

const (
	// Constant returns (CCR; Charnes, Cooper & Rhodes 1978): sum(lambda) free.
	Constant Returns = "constant"
	// Variable returns (BCC; Banker, Charnes & Cooper 1984): sum(lambda) = 1.
	Variable Returns = "variable"
	// NonIncreasing returns: sum(lambda) <= 1.
	NonIncreasing Returns = "non-increasing"
	// NonDecreasing returns: sum(lambda) >= 1.
	NonDecreasing Returns = "non-decreasing"
	// Bounded returns: Model.Lower <= sum(lambda) <= Model.Upper.
	Bounded Returns = "bounded"
)

// Orientation says whether a unit is projected to the frontier by shrinking
// its inputs (input) or by expanding its outputs (output).
type Orientation string

const (
	Input  Orientation = "input"
	Output Orientation = "output"
)

// Model holds the settings of a radial envelopment model. Its zero value is
// not valid; use DefaultModel or set Returns and Orientation.
type Model struct {
	Returns     Returns     `json:"returns"`
	Lower       float64     `json:"lower,omitempty"` // only for Bounded
	Upper       float64     `json:"upper,omitempty"` // only for Bounded; 0 or +Inf means no upper bound
	Orientation Orientation `json:"orientation"`
	// SecondStage maximises the slacks once the radial score is fixed.
	SecondStage bool `json:"secondStage"`
	// Super adds super-efficiency (Andersen & Petersen 1993) scores.
	Super bool `json:"super"`
	// ScaleDetail adds the constant / variable / non-increasing comparison
	// that gives each unit's returns-to-scale class and scale efficiency.
	ScaleDetail bool `json:"scaleDetail"`
}

// DefaultModel is variable returns, input orientation, with the second stage
// and the returns-to-scale detail.
func DefaultModel() Model {
	return Model{Returns: Variable, Orientation: Input, SecondStage: true, ScaleDetail: true}
}

// Validate reports a setting that cannot be solved.
func (m Model) Validate() error {
	switch m.Returns {
	case Constant, Variable, NonIncreasing, NonDecreasing:
	case Bounded:
		if m.Lower < 0 || (m.Upper != 0 && m.Upper < m.Lower) {
			return fmt.Errorf("dea: bounds on the sum of lambdas must satisfy 0 <= lower <= upper (got %g, %g)", m.Lower, m.Upper)
		}
	default:
		return fmt.Errorf("dea: unknown returns to scale %q", m.Returns)
	}
	switch m.Orientation {
	case Input, Output:
	default:
		return fmt.Errorf("dea: unknown orientation %q", m.Orientation)
	}
	return nil
}

// Data is the table a model runs on: one row per unit, inputs and outputs in
// separate matrices so the models never need to know about roles.
type Data struct {
	Units       []string    `json:"units"`
	InputNames  []string    `json:"inputNames"`
	OutputNames []string    `json:"outputNames"`
	X           [][]float64 `json:"x"` // X[unit][input]
	Y           [][]float64 `json:"y"` // Y[unit][output]
}

// Status classifies a unit's result.
type Status string

const (
	Efficient       Status = "efficient"        // score 1, no slack
	WeaklyEfficient Status = "weakly efficient" // score 1, some slack
	Inefficient     Status = "inefficient"      // score below 1
	NotSolved       Status = "not solved"       // the LP failed; see UnitResult.Problem
)

// ScaleClass is a unit's returns-to-scale class.
type ScaleClass string

const (
	ScaleConstant   ScaleClass = "constant"
	ScaleIncreasing ScaleClass = "increasing"
	ScaleDecreasing ScaleClass = "decreasing"
)

// Peer is one unit of the reference combination that a unit is compared with.
type Peer struct {
	Index  int     `json:"index"`
	Name   string  `json:"name"`
	Lambda float64 `json:"lambda"`
}

// Target is the projection of one measure of one unit onto the frontier.
// Target = Value - Radial - Slack for inputs and Value + Radial + Slack for
// outputs; Radial and Slack are both reported as non-negative amounts.
type Target struct {
	Measure string  `json:"measure"`
	Value   float64 `json:"value"`
	Radial  float64 `json:"radial"` // movement from the proportional (radial) part
	Slack   float64 `json:"slack"`  // further movement from the second stage
	Target  float64 `json:"target"`
	Change  float64 `json:"changePercent"` // (Target - Value) / Value * 100; NaN when Value is 0
}

// Weight is the multiplier (dual) weight of one measure and its share of the
// unit's virtual input or output.
type Weight struct {
	Measure string  `json:"measure"`
	Weight  float64 `json:"weight"`
	Share   float64 `json:"share"` // weight*value / sum over the same side
}

// Certificate is an independent check of a unit's LP solution: primal and dual
// feasibility and the gap between the two objectives, computed from the data,
// not taken from the solver.
type Certificate struct {
	Verified    bool    `json:"verified"`
	PrimalError float64 `json:"primalError"`  // largest primal constraint violation (scaled)
	DualError   float64 `json:"dualError"`    // largest dual constraint violation (scaled)
	Gap         float64 `json:"gap"`          // |primal objective - dual objective|
	Tolerance   float64 `json:"tolerance"`    // the bound all three must meet
	Checked     int     `json:"checkedUnits"` // how many units the dual check covered
}

// UnitResult is everything reported for one unit.
type UnitResult struct {
	Index int    `json:"index"`
	Name  string `json:"name"`
	// Score is theta (input orientation) or 1/phi (output orientation).
	Score float64 `json:"score"`
	// Expansion is phi, the output expansion factor (output orientation only; 0 otherwise).
	Expansion float64     `json:"expansion,omitempty"`
	Status    Status      `json:"status"`
	Peers     []Peer      `json:"peers"`
	PeerCount int         `json:"peerCount"` // how many other units name this unit as a peer
	Inputs    []Target    `json:"inputs"`
	Outputs   []Target    `json:"outputs"`
	InputW    []Weight    `json:"inputWeights"`
	OutputW   []Weight    `json:"outputWeights"`
	Free      float64     `json:"free"` // the free variable of the multiplier form (variable returns and its relatives)
	Cert      Certificate `json:"certificate"`
	Problem   string      `json:"problem,omitempty"` // plain words when the LP failed

	// Returns-to-scale detail (Model.ScaleDetail).
	ScoreCRS   float64    `json:"scoreCRS,omitempty"`
	ScoreVRS   float64    `json:"scoreVRS,omitempty"`
	ScoreNIRS  float64    `json:"scoreNIRS,omitempty"`
	ScaleEff   float64    `json:"scaleEfficiency,omitempty"`
	ScaleClass ScaleClass `json:"scaleClass,omitempty"`

	// Super-efficiency (Model.Super): nil when no finite value exists, and
	// SuperNote says why in plain words.
	Super     *float64     `json:"super"`
	SuperCert *Certificate `json:"superCertificate,omitempty"`
	SuperNote string       `json:"superNote,omitempty"`
}

// Result is a whole run.
type Result struct {
	Model Model        `json:"model"`
	Units []UnitResult `json:"units"`
	// Frontier lists the indices of the extreme-efficient units found first.
	Frontier []int `json:"frontier"`
}
