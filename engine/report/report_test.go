package report

import (
	"math"
	"strings"
	"testing"

	"peerlens/engine/dea"
)

// northgate is a hand-made inefficient unit (input orientation) whose
// numbers are consistent: score 0.8, Staff 20 -> 15 (4 radial, 1 slack),
// Budget 500 -> 400 (100 radial), Visits 1000 -> 1050 (50 slack).
func northgate() dea.UnitResult {
	s := 0.8
	return dea.UnitResult{
		Index: 3, Name: "Northgate", Score: 0.8, Status: dea.Inefficient,
		Peers:     []dea.Peer{{Index: 0, Name: "Ashby", Lambda: 0.42}, {Index: 5, Name: "Brook Lane", Lambda: 0.58}},
		PeerCount: 0,
		Inputs: []dea.Target{
			{Measure: "Staff", Value: 20, Radial: 4, Slack: 1, Target: 15, Change: -25},
			{Measure: "Budget", Value: 500, Radial: 100, Slack: 0, Target: 400, Change: -20},
		},
		Outputs: []dea.Target{
			{Measure: "Visits", Value: 1000, Radial: 0, Slack: 50, Target: 1050, Change: 5},
		},
		InputW:   []dea.Weight{{Measure: "Staff", Weight: 0.03, Share: 0.6}, {Measure: "Budget", Weight: 0.0008, Share: 0.4}},
		OutputW:  []dea.Weight{{Measure: "Visits", Weight: 0.0008, Share: 1}},
		Cert:     dea.Certificate{Verified: true, PrimalError: 1e-10, DualError: 2e-11, Gap: 3e-12, Tolerance: 1e-7},
		ScoreCRS: 0.72, ScoreVRS: 0.8, ScoreNIRS: 0.72, ScaleEff: 0.9, ScaleClass: dea.ScaleIncreasing,
		Super: &s,
	}
}

func allText(r UnitReport) string { return r.Text() }

func wantAll(t *testing.T, text string, want []string) {
	t.Helper()
	for _, w := range want {
		if !strings.Contains(text, w) {
			t.Errorf("report lacks %q\nreport:\n%s", w, text)
		}
	}
}

// The numbers in the sentences are the numbers of the hand-made result.
func TestInefficientInputUnit(t *testing.T) {
	m := dea.Model{Returns: dea.Variable, Orientation: dea.Input, SecondStage: true, ScaleDetail: true, Super: true}
	r := Unit(northgate(), m)
	if r.Unit != "Northgate" {
		t.Errorf("Unit = %q", r.Unit)
	}
	wantAll(t, r.Summary, []string{"Northgate could produce its current outputs with 80% of its inputs", "20% less of every input", "its score is 80%"})
	wantAll(t, allText(r), []string{
		"Staff: 20 today, target 15 (-25%): 4 less from the proportional change and 1 less of slack.",
		"Budget: 500 today, target 400 (-20%): 100 less from the proportional change.",
		"Visits: 1,000 today, target 1,050 (+5%): 50 more of slack.",
		"compared with 2 peers: Ashby (weight 0.42) and Brook Lane (weight 0.58)",
		"its inputs count as Staff 60% and Budget 40% of the total",
		"its outputs count as Visits 100% of the total",
		"constant returns to scale its score is 72%, under variable returns 80%; its scale efficiency is 90%",
		"increasing returns to scale",
		"super-efficiency score, against the other units only (Andersen & Petersen 1993), is 80%",
		"equals its score",
		"Verified", "largest error 1.0e-10", "tolerance 1.0e-07",
	})
}

func TestOutputOrientation(t *testing.T) {
	u := northgate()
	u.Expansion = 1.25
	m := dea.Model{Returns: dea.Constant, Orientation: dea.Output}
	r := Unit(u, m)
	wantAll(t, r.Summary, []string{"could produce 125% of its current outputs (25% more)", "its score is 80%"})
	if strings.Contains(r.Text(), "Super-efficiency") {
		t.Error("super-efficiency section without Model.Super")
	}
	// Expansion left at zero: phi is 1/score.
	u.Expansion = 0
	wantAll(t, Unit(u, m).Summary, []string{"125% of its current outputs"})
}

func TestEfficientUnitWithSuperEfficiency(t *testing.T) {
	s := 1.234
	u := dea.UnitResult{
		Index: 0, Name: "Ashby", Score: 1, Status: dea.Efficient,
		Peers: []dea.Peer{{Index: 0, Name: "Ashby", Lambda: 1}}, PeerCount: 4,
		Inputs:  []dea.Target{{Measure: "Staff", Value: 12, Target: 12}},
		Outputs: []dea.Target{{Measure: "Visits", Value: 900, Target: 900}},
		InputW:  []dea.Weight{{Measure: "Staff", Weight: 1.0 / 12, Share: 1}},
		OutputW: []dea.Weight{{Measure: "Visits", Weight: 0, Share: 0}},
		Cert:    dea.Certificate{Verified: false, PrimalError: 3e-5, Tolerance: 1e-7},
		Super:   &s,
	}
	text := Unit(u, dea.Model{Returns: dea.Constant, Orientation: dea.Input, Super: true}).Text()
	wantAll(t, text, []string{
		"Ashby is efficient (score 100%)",
		"Staff: 12 today; the target is the same.",
		"Ashby is its own peer",
		"4 other units have it among their peers.",
		"Visits gets no weight",
		"is 123.4%", "It could use 23.4% more of every input",
		"Not verified", "3.0e-05",
	})
	text = Unit(u, dea.Model{Returns: dea.Constant, Orientation: dea.Output, Super: true}).Text()
	// 1 - 1/1.234 = 0.18963
	wantAll(t, text, []string{"Its outputs could fall by 19%"})
	u.Super, u.SuperNote = nil, "the variable-returns model has no solution for this unit"
	text = Unit(u, dea.Model{Returns: dea.Variable, Orientation: dea.Input, Super: true}).Text()
	wantAll(t, text, []string{"No super-efficiency score exists for Ashby: the variable-returns model has no solution for this unit."})
}

func TestWeaklyEfficientAndNotSolved(t *testing.T) {
	u := dea.UnitResult{Name: "Cray", Score: 1, Status: dea.WeaklyEfficient,
		Inputs: []dea.Target{{Measure: "Staff", Value: 10, Slack: 2, Target: 8, Change: -20}, {Measure: "Budget", Value: 5, Target: 5}}}
	r := Unit(u, dea.DefaultModel())
	wantAll(t, r.Summary, []string{"weakly efficient", "Staff could still improve"})
	wantAll(t, r.Text(), []string{"Staff: 10 today, target 8 (-20%): 2 less of slack."})

	u = dea.UnitResult{Name: "Dunmore", Status: dea.NotSolved, Problem: "the solver ran out of iterations."}
	r = Unit(u, dea.DefaultModel())
	if r.Summary != "No result could be computed for Dunmore: the solver ran out of iterations." || len(r.Sections) != 0 {
		t.Errorf("not-solved report = %+v", r)
	}
}

func TestZeroValueTarget(t *testing.T) {
	got := target(dea.Target{Measure: "Visits", Value: 0, Slack: 3, Target: 3, Change: math.NaN()}, false)
	if got != "Visits: 0 today, target 3 (from zero): 3 more of slack." {
		t.Errorf("target = %q", got)
	}
}

func TestNumberAndPercent(t *testing.T) {
	for _, tc := range []struct {
		v    float64
		want string
	}{
		{0, "0"}, {3.0976, "3.1"}, {14.5024, "14.5"}, {17.6, "17.6"}, {20, "20"},
		{1234.6, "1,235"}, {-1234567, "-1,234,567"}, {0.42, "0.42"}, {0.04321, "0.0432"},
		{0.000123456, "0.000123"}, {-0.0000001, "-0.0000001"}, {math.NaN(), "not defined"}, {math.Inf(1), "unbounded"},
	} {
		if got := Number(tc.v); got != tc.want {
			t.Errorf("Number(%v) = %q, want %q", tc.v, got, tc.want)
		}
	}
	for _, tc := range []struct {
		v    float64
		want string
	}{{0.824, "82.4%"}, {1, "100%"}, {0.17600000001, "17.6%"}, {1.2346, "123.5%"}, {0, "0%"}} {
		if got := Percent(tc.v); got != tc.want {
			t.Errorf("Percent(%v) = %q, want %q", tc.v, got, tc.want)
		}
	}
}

func TestDescribe(t *testing.T) {
	for _, tc := range []struct {
		m       dea.Model
		want    string
		sources []Source
	}{
		{dea.Model{Returns: dea.Constant, Orientation: dea.Input}, "CCR model", []Source{CCR}},
		{dea.Model{Returns: dea.Variable, Orientation: dea.Output}, "BCC model", []Source{BCC}},
		{dea.Model{Returns: dea.Variable, Orientation: dea.Input, SecondStage: true, ScaleDetail: true, Super: true}, "Super-efficiency", []Source{BCC, CST, FGL, AP}},
		{dea.Model{Returns: dea.Bounded, Lower: 0.8, Upper: 1.2, Orientation: dea.Input}, "at least 0.8 and at most 1.2", []Source{CST}},
	} {
		d := Describe(tc.m)
		text := strings.Join(d.Sentences, " ")
		if !strings.Contains(text, tc.want) {
			t.Errorf("Describe(%+v) lacks %q: %s", tc.m, tc.want, text)
		}
		if len(d.Sources) != len(tc.sources) {
			t.Errorf("Describe(%+v) sources = %v, want %v", tc.m, d.Sources, tc.sources)
			continue
		}
		for i := range tc.sources {
			if d.Sources[i] != tc.sources[i] {
				t.Errorf("Describe(%+v) source %d = %v, want %v", tc.m, i, d.Sources[i], tc.sources[i])
			}
		}
	}
	if !strings.Contains(CCR.String(), "1978") || !strings.Contains(AP.String(), "39(10) 1261-1264") {
		t.Error("source text lacks year or pages")
	}
}

// Rule of thumb n >= max(m*s, 3(m+s)): Cooper, Seiford & Tone (2007), from memory.
func TestSampleCaution(t *testing.T) {
	for _, tc := range []struct {
		n, m, s int
		warn    bool
	}{
		{12, 2, 2, false}, {11, 2, 2, true}, {24, 4, 6, true}, {29, 4, 6, true}, {30, 4, 6, false}, {35, 5, 7, true}, {36, 5, 7, false}, {36, 6, 6, false}, {35, 6, 6, true},
	} {
		got := SampleCaution(tc.n, tc.m, tc.s)
		if (got != "") != tc.warn {
			t.Errorf("SampleCaution(%d, %d, %d) = %q, want warning %v", tc.n, tc.m, tc.s, got, tc.warn)
		}
	}
	if len(Cautions) < 3 || !strings.Contains(strings.Join(Cautions, " "), "human review") {
		t.Error("cautions incomplete")
	}
}
