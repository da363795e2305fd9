package export

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"time"

	"peerlens/engine/dea"
	"peerlens/engine/report"
	"peerlens/engine/study"
)

// Kind says what a Cell holds.
type Kind uint8

const (
	Empty  Kind = iota // no value (a left-out unit, an undefined number)
	Text               // a string
	Number             // a finite float64
)

// Cell is one typed cell of an exported table.
type Cell struct {
	Kind Kind
	Text string
	Num  float64
}

// T is a text cell.
func T(s string) Cell { return Cell{Kind: Text, Text: s} }

// N is a number cell; NaN and infinities give an empty cell.
func N(v float64) Cell {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return Cell{}
	}
	return Cell{Kind: Number, Num: v}
}

// Table is one exported table: a header row and data rows of equal width.
type Table struct {
	Name   string // sheet name
	Header []string
	Rows   [][]Cell
}

// Meta is what the Settings table records besides the model.
type Meta struct {
	Date    time.Time
	Version string // Peerlens version
}

// ErrMismatch is returned when a result does not belong to the study given
// with it (the units differ).
var ErrMismatch = errors.New("export: the results do not belong to this study; run it again")

// rows maps each study unit to its result, or nil for a left-out unit.
func rows(s *study.Study, r *dea.Result) ([]*dea.UnitResult, error) {
	if s == nil || r == nil {
		return nil, errors.New("export: no study or no results")
	}
	inc := s.Included()
	if len(inc) != len(r.Units) {
		return nil, fmt.Errorf("%w (%d units in the run, %d in the study's run list)", ErrMismatch, len(r.Units), len(inc))
	}
	out := make([]*dea.UnitResult, len(s.Units))
	for k := range r.Units {
		u := &r.Units[k]
		if u.Index < 0 || u.Index >= len(inc) || s.Units[inc[u.Index]] != u.Name {
			return nil, fmt.Errorf("%w (unit %q)", ErrMismatch, u.Name)
		}
		out[inc[u.Index]] = u
	}
	return out, nil
}

// measures returns the names of the study's inputs and outputs, in order.
func measures(s *study.Study) (in, out []string) {
	for _, m := range s.Measures {
		switch m.Role {
		case study.Input:
			in = append(in, m.Name)
		case study.Output:
			out = append(out, m.Name)
		}
	}
	return in, out
}

// StatusLeftOut is the status written for a unit left out of the run.
const StatusLeftOut = "left out"

// Results is one row per study unit: score, status, returns to scale, scale
// efficiency, super-efficiency, peers and the check; with wide set, also the
// target and slack of every measure and the weights, so one CSV file holds
// the whole run.
func Results(s *study.Study, r *dea.Result, wide bool) (*Table, error) {
	units, err := rows(s, r)
	if err != nil {
		return nil, err
	}
	in, out := measures(s)
	t := &Table{Name: "Results", Header: []string{"unit", "score", "status", "returns to scale", "scale efficiency", "super-efficiency", "peers", "named as peer by", "verified"}}
	if wide {
		for _, side := range [][]string{in, out} {
			for _, m := range side {
				t.Header = append(t.Header, "target "+m, "slack "+m)
			}
		}
		for _, side := range [][]string{in, out} {
			for _, m := range side {
				t.Header = append(t.Header, "weight "+m)
			}
		}
	}
	for i, u := range units {
		row := make([]Cell, 0, len(t.Header))
		row = append(row, T(s.Units[i]))
		if u == nil {
			row = append(row, Cell{}, T(StatusLeftOut))
			t.Rows = append(t.Rows, pad(row, len(t.Header)))
			continue
		}
		solved := u.Status != dea.NotSolved
		row = append(row, numIf(solved, u.Score), T(string(u.Status)), T(string(u.ScaleClass)), numIf(u.ScaleClass != "", u.ScaleEff))
		if u.Super != nil {
			row = append(row, N(*u.Super))
		} else {
			row = append(row, Cell{})
		}
		row = append(row, T(Peers(u.Peers)), N(float64(u.PeerCount)), T(yesNo(u.Cert.Verified)))
		if wide {
			for _, ts := range [][]dea.Target{u.Inputs, u.Outputs} {
				for _, x := range ts {
					row = append(row, numIf(solved, x.Target), numIf(solved, x.Slack))
				}
			}
			for _, ws := range [][]dea.Weight{u.InputW, u.OutputW} {
				for _, w := range ws {
					row = append(row, numIf(solved, w.Weight))
				}
			}
		}
		if len(row) > len(t.Header) {
			return nil, fmt.Errorf("%w (unit %q has more measures than the study)", ErrMismatch, u.Name)
		}
		t.Rows = append(t.Rows, pad(row, len(t.Header)))
	}
	return t, nil
}

// Peers writes a unit's peers as "A (0.42); B (0.58)".
func Peers(ps []dea.Peer) string {
	parts := make([]string, len(ps))
	for i, p := range ps {
		parts[i] = fmt.Sprintf("%s (%s)", p.Name, formatNum(p.Lambda))
	}
	return strings.Join(parts, "; ")
}

// Targets is one row per unit and input or output: value today, the
// proportional (radial) change, the slack, the target and the change in
// percent.
func Targets(s *study.Study, r *dea.Result) (*Table, error) {
	units, err := rows(s, r)
	if err != nil {
		return nil, err
	}
	t := &Table{Name: "Targets", Header: []string{"unit", "measure", "role", "value", "radial", "slack", "target", "change %"}}
	for _, u := range units {
		if u == nil || u.Status == dea.NotSolved {
			continue
		}
		for _, side := range []struct {
			role string
			ts   []dea.Target
		}{{"input", u.Inputs}, {"output", u.Outputs}} {
			for _, x := range side.ts {
				t.Rows = append(t.Rows, []Cell{T(u.Name), T(x.Measure), T(side.role), N(x.Value), N(x.Radial), N(x.Slack), N(x.Target), N(x.Change)})
			}
		}
	}
	return t, nil
}

// Weights is one row per unit and measure: the multiplier weight and its
// share of the unit's weighted inputs or outputs.
func Weights(s *study.Study, r *dea.Result) (*Table, error) {
	units, err := rows(s, r)
	if err != nil {
		return nil, err
	}
	t := &Table{Name: "Weights", Header: []string{"unit", "measure", "role", "weight", "share"}}
	for _, u := range units {
		if u == nil || u.Status == dea.NotSolved {
			continue
		}
		for _, side := range []struct {
			role string
			ws   []dea.Weight
		}{{"input", u.InputW}, {"output", u.OutputW}} {
			for _, w := range side.ws {
				t.Rows = append(t.Rows, []Cell{T(u.Name), T(w.Measure), T(side.role), N(w.Weight), N(w.Share)})
			}
		}
	}
	return t, nil
}

// Settings records the model, the roles, the date, the Peerlens version and
// the cautions, one setting per row.
func Settings(s *study.Study, r *dea.Result, meta Meta) *Table {
	m := r.Model
	t := &Table{Name: "Settings", Header: []string{"setting", "value"}}
	add := func(k string, v Cell) { t.Rows = append(t.Rows, []Cell{T(k), v}) }
	add("study", T(s.Title))
	add("date", T(meta.Date.Format("2006-01-02 15:04 MST")))
	add("Peerlens version", T(meta.Version))
	add("returns to scale", T(string(m.Returns)))
	if m.Returns == dea.Bounded {
		add("lower bound on the sum of peer weights", N(m.Lower))
		add("upper bound on the sum of peer weights", N(m.Upper))
	}
	add("orientation", T(string(m.Orientation)))
	add("slacks (second stage)", T(yesNo(m.SecondStage)))
	add("super-efficiency", T(yesNo(m.Super)))
	add("returns-to-scale detail", T(yesNo(m.ScaleDetail)))
	for _, x := range s.Measures {
		add("role of "+x.Name, T(string(x.Role)))
	}
	add("units in the run", N(float64(len(r.Units))))
	add("units left out", N(float64(len(s.Units)-len(r.Units))))
	for _, sentence := range report.Describe(m).Sentences {
		add("method", T(sentence))
	}
	for _, src := range report.Describe(m).Sources {
		add("source", T(src.String()))
	}
	for _, c := range report.Cautions {
		add("caution", T(c))
	}
	in, out := measures(s)
	if c := report.SampleCaution(len(r.Units), len(in), len(out)); c != "" {
		add("caution", T(c))
	}
	return t
}

// Data is the study's table as used: every unit (left-out units marked),
// every measure and the text columns kept with the study.
func Data(s *study.Study) *Table {
	t := &Table{Name: "Data", Header: []string{"unit", "in the run"}}
	for _, m := range s.Measures {
		t.Header = append(t.Header, m.Name)
	}
	for _, x := range s.Extra {
		t.Header = append(t.Header, x.Name)
	}
	in := make(map[int]bool)
	for _, i := range s.Included() {
		in[i] = true
	}
	for i, name := range s.Units {
		row := []Cell{T(name), T(yesNo(in[i]))}
		if !in[i] {
			row[1] = T(StatusLeftOut)
		}
		for j := range s.Measures {
			v := math.NaN()
			if i < len(s.Values) && j < len(s.Values[i]) {
				v = s.Values[i][j]
			}
			row = append(row, N(v))
		}
		for _, x := range s.Extra {
			c := Cell{}
			if i < len(x.Cells) {
				c = T(x.Cells[i])
			}
			row = append(row, c)
		}
		t.Rows = append(t.Rows, row)
	}
	return t
}

func numIf(ok bool, v float64) Cell {
	if !ok {
		return Cell{}
	}
	return N(v)
}

func pad(row []Cell, n int) []Cell {
	for len(row) < n {
		row = append(row, Cell{})
	}
	return row
}

func yesNo(b bool) string {
	if b {
		return "yes"
	}
	return "no"
}
