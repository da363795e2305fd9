package report

import (
	"fmt"

	"peerlens/engine/dea"
)

// Source is a published reference for a method.
type Source struct {
	Authors string `json:"authors"`
	Year    int    `json:"year"`
	Title   string `json:"title"`
	Where   string `json:"where"`
}

func (s Source) String() string {
	return fmt.Sprintf("%s (%d), %s, %s", s.Authors, s.Year, s.Title, s.Where)
}

// The sources the method descriptions cite.
var (
	CCR = Source{"Charnes, Cooper & Rhodes", 1978, "Measuring the efficiency of decision making units", "European Journal of Operational Research 2(6) 429-444"}
	BCC = Source{"Banker, Charnes & Cooper", 1984, "Some models for estimating technical and scale inefficiencies in data envelopment analysis", "Management Science 30(9) 1078-1092"}
	AP  = Source{"Andersen & Petersen", 1993, "A procedure for ranking efficient units in data envelopment analysis", "Management Science 39(10) 1261-1264"}
	FGL = Source{"Färe, Grosskopf & Lovell", 1994, "Production Frontiers", "Cambridge University Press"}
	CST = Source{"Cooper, Seiford & Tone", 2007, "Data Envelopment Analysis: A Comprehensive Text, 2nd ed.", "Springer"}
)

// Method describes model m in plain words, one sentence per setting, with
// the sources it rests on.
type Method struct {
	Sentences []string `json:"sentences"`
	Sources   []Source `json:"sources"`
}

// Describe explains the settings of m in plain words.
func Describe(m dea.Model) Method {
	var d Method
	switch m.Returns {
	case dea.Constant:
		d.Sentences = append(d.Sentences, "Constant returns to scale (the CCR model): each unit is compared with any scaled-up or scaled-down combination of the others, so small and large units are held to the same ratio of outputs to inputs.")
		d.Sources = append(d.Sources, CCR)
	case dea.Variable:
		d.Sentences = append(d.Sentences, "Variable returns to scale (the BCC model): each unit is compared only with weighted averages of the others, so it is held to the standard of units of a similar size.")
		d.Sources = append(d.Sources, BCC)
	case dea.NonIncreasing:
		d.Sentences = append(d.Sentences, "Non-increasing returns to scale: each unit is compared with weighted averages of the others or scaled-down versions of them, never scaled-up ones.")
		d.Sources = append(d.Sources, FGL)
	case dea.NonDecreasing:
		d.Sentences = append(d.Sentences, "Non-decreasing returns to scale: each unit is compared with weighted averages of the others or scaled-up versions of them, never scaled-down ones.")
		d.Sources = append(d.Sources, FGL)
	case dea.Bounded:
		upper := "no upper bound"
		if m.Upper > 0 {
			upper = "at most " + Number(m.Upper)
		}
		d.Sentences = append(d.Sentences, fmt.Sprintf("Bounded returns to scale: the weights of the peers add up to at least %s and %s.", Number(m.Lower), upper))
		d.Sources = append(d.Sources, CST)
	}
	switch m.Orientation {
	case dea.Input:
		d.Sentences = append(d.Sentences, "Input orientation: the score is the share of its inputs a unit would need to produce its current outputs as well as its peers do (100% means no proportional saving is possible).")
	case dea.Output:
		d.Sentences = append(d.Sentences, "Output orientation: the score is its current outputs as a share of what its peers show it could produce with the same inputs (100% means no proportional increase is possible).")
	}
	if m.SecondStage {
		d.Sentences = append(d.Sentences, "After the proportional change, a second step finds the largest further changes in single measures (slacks); a unit is fully efficient only when its score is 100% and every slack is zero.")
		d.Sources = appendOnce(d.Sources, CST)
	}
	if m.ScaleDetail {
		d.Sentences = append(d.Sentences, "Returns to scale: each unit is also scored under constant, variable and non-increasing returns; scale efficiency is the constant-returns score divided by the variable-returns score, and the non-increasing score tells whether a unit is below or above its most productive size.")
		d.Sources = appendOnce(d.Sources, BCC)
		d.Sources = appendOnce(d.Sources, FGL)
	}
	if m.Super {
		d.Sentences = append(d.Sentences, "Super-efficiency: each unit is also scored against the other units only, leaving itself out, so efficient units can be told apart (scores above 100%); under variable returns the score may not exist for some units.")
		d.Sources = appendOnce(d.Sources, AP)
	}
	d.Sentences = append(d.Sentences, "Every score is checked independently: the solution and its weights are tested against the data, and the two sides of the calculation must agree within a stated tolerance.")
	return d
}

func appendOnce(list []Source, s Source) []Source {
	for _, x := range list {
		if x == s {
			return list
		}
	}
	return append(list, s)
}

// Cautions are the warnings that travel with every set of scores.
var Cautions = []string{
	"The scores are relative to the units in this sample: a unit on the frontier is the best here, not necessarily good.",
	"The scores are sensitive to the choice of inputs and outputs, to outliers and errors in the data, and to the number of units compared.",
	"They inform managers' judgement and do not replace it; decisions about people or funding deserve human review.",
}

// SampleCaution returns a warning when there are few units for the number of
// measures, by the rule of thumb n >= max(m*s, 3(m+s)) for m inputs and s
// outputs (Cooper, Seiford & Tone 2007), or "" when the sample is large
// enough.
func SampleCaution(units, inputs, outputs int) string {
	need := max(inputs*outputs, 3*(inputs+outputs))
	if units >= need {
		return ""
	}
	return fmt.Sprintf("With %d units for %d inputs and %d outputs, many units may look efficient only because there are few to compare with; a common rule of thumb asks for at least %d units.", units, inputs, outputs, need)
}
