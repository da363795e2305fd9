package report

import (
	"fmt"
	"math"
	"strings"

	"peerlens/engine/dea"
)

// Section is one titled group of sentences.
type Section struct {
	Title     string   `json:"title"`
	Sentences []string `json:"sentences"`
}

// UnitReport is the plain-words account of one unit's result.
type UnitReport struct {
	Unit string `json:"unit"`
	// Summary is the one sentence to show first.
	Summary  string    `json:"summary"`
	Sections []Section `json:"sections"`
}

// Text returns the whole report as plain text, one paragraph per section.
func (r UnitReport) Text() string {
	var b strings.Builder
	b.WriteString(r.Summary)
	b.WriteString("\n")
	for _, s := range r.Sections {
		b.WriteString("\n")
		b.WriteString(s.Title)
		b.WriteString("\n")
		b.WriteString(strings.Join(s.Sentences, " "))
		b.WriteString("\n")
	}
	return b.String()
}

// small is the amount below which a radial or slack movement is treated as
// none in the sentences (the engine's own numbers are kept as computed).
const small = 1e-9

// Unit explains one unit's result under model m.
func Unit(u dea.UnitResult, m dea.Model) UnitReport {
	r := UnitReport{Unit: u.Name}
	if u.Status == dea.NotSolved {
		why := u.Problem
		if why == "" {
			why = "the calculation did not finish"
		}
		r.Summary = fmt.Sprintf("No result could be computed for %s: %s.", u.Name, strings.TrimSuffix(why, "."))
		return r
	}
	r.Summary = summary(u, m)
	r.Sections = append(r.Sections, Section{Title: "Targets", Sentences: targets(u, m)})
	r.Sections = append(r.Sections, Section{Title: "Peers", Sentences: peers(u)})
	if s := weights(u); len(s) > 0 {
		r.Sections = append(r.Sections, Section{Title: "Weights", Sentences: s})
	}
	if s := scale(u); len(s) > 0 {
		r.Sections = append(r.Sections, Section{Title: "Returns to scale", Sentences: s})
	}
	if s := super(u, m); len(s) > 0 {
		r.Sections = append(r.Sections, Section{Title: "Super-efficiency", Sentences: s})
	}
	r.Sections = append(r.Sections, Section{Title: "Check", Sentences: check(u)})
	return r
}

func summary(u dea.UnitResult, m dea.Model) string {
	switch u.Status {
	case dea.Efficient:
		if m.Orientation == dea.Output {
			return fmt.Sprintf("%s is efficient (score 100%%): no combination of the other units produces more of its outputs with its inputs, and no single measure can be improved.", u.Name)
		}
		return fmt.Sprintf("%s is efficient (score 100%%): no combination of the other units produces its outputs with less input, and no single measure can be improved.", u.Name)
	case dea.WeaklyEfficient:
		return fmt.Sprintf("%s has the top score of 100%% but is only weakly efficient: its peers show that %s could still improve without any proportional change.", u.Name, list(slackMeasures(u)))
	}
	if m.Orientation == dea.Output {
		phi := u.Expansion
		if phi == 0 && u.Score > 0 {
			phi = 1 / u.Score
		}
		return fmt.Sprintf("%s could produce %s of its current outputs (%s more) with the inputs it uses today; its score is %s.",
			u.Name, Percent(phi), Percent(phi-1), Percent(u.Score))
	}
	return fmt.Sprintf("%s could produce its current outputs with %s of its inputs: %s less of every input; its score is %s.",
		u.Name, Percent(u.Score), Percent(1-u.Score), Percent(u.Score))
}

// slackMeasures names the measures with a slack.
func slackMeasures(u dea.UnitResult) []string {
	var names []string
	for _, t := range u.Inputs {
		if t.Slack > small {
			names = append(names, t.Measure)
		}
	}
	for _, t := range u.Outputs {
		if t.Slack > small {
			names = append(names, t.Measure)
		}
	}
	if len(names) == 0 {
		names = []string{"some measures"}
	}
	return names
}

func targets(u dea.UnitResult, m dea.Model) []string {
	var out []string
	for _, t := range u.Inputs {
		out = append(out, target(t, true))
	}
	for _, t := range u.Outputs {
		out = append(out, target(t, false))
	}
	part := "inputs"
	if m.Orientation == dea.Output {
		part = "outputs"
	}
	out = append(out, fmt.Sprintf("The proportional (radial) part moves all %s by the same percentage; slack is a further change in a single measure that the peers show is possible after that.", part))
	return out
}

// target describes one measure's target against today's value.
func target(t dea.Target, input bool) string {
	less := "less"
	if !input {
		less = "more"
	}
	if t.Radial <= small && t.Slack <= small {
		return fmt.Sprintf("%s: %s today; the target is the same.", t.Measure, Number(t.Value))
	}
	var change string
	if math.IsNaN(t.Change) || t.Value == 0 {
		change = "from zero"
	} else {
		change = signed(t.Change) + "%"
	}
	var parts []string
	if t.Radial > small {
		parts = append(parts, fmt.Sprintf("%s %s from the proportional change", Number(t.Radial), less))
	}
	if t.Slack > small {
		parts = append(parts, fmt.Sprintf("%s %s of slack", Number(t.Slack), less))
	}
	return fmt.Sprintf("%s: %s today, target %s (%s): %s.", t.Measure, Number(t.Value), Number(t.Target), change, strings.Join(parts, " and "))
}

// signed formats a percentage change with its sign and one decimal.
func signed(p float64) string {
	s := strings.TrimSuffix(Percent(p/100), "%")
	if p > 0 && s != "0" {
		return "+" + s
	}
	return s
}

func peers(u dea.UnitResult) []string {
	var out []string
	switch {
	case len(u.Peers) == 0:
	case len(u.Peers) == 1 && u.Peers[0].Index == u.Index:
		out = append(out, fmt.Sprintf("%s is its own peer: it is on the frontier.", u.Name))
	default:
		items := make([]string, len(u.Peers))
		for i, p := range u.Peers {
			items[i] = fmt.Sprintf("%s (weight %s)", p.Name, Number(p.Lambda))
		}
		noun := "peers"
		if len(u.Peers) == 1 {
			noun = "peer"
		}
		out = append(out, fmt.Sprintf("%s is compared with %d %s: %s. Its targets are this weighted combination of their inputs and outputs.",
			u.Name, len(u.Peers), noun, list(items)))
	}
	switch u.PeerCount {
	case 0:
		if u.Status == dea.Efficient {
			out = append(out, "No other unit has it among its peers.")
		}
	case 1:
		out = append(out, "One other unit has it among its peers.")
	default:
		out = append(out, fmt.Sprintf("%d other units have it among their peers.", u.PeerCount))
	}
	return out
}

func weights(u dea.UnitResult) []string {
	if len(u.InputW) == 0 && len(u.OutputW) == 0 {
		return nil
	}
	var out []string
	side := func(ws []dea.Weight, what string) {
		if len(ws) == 0 {
			return
		}
		items := make([]string, len(ws))
		var zero []string
		for i, w := range ws {
			items[i] = fmt.Sprintf("%s %s", w.Measure, Percent(w.Share))
			if w.Weight <= small {
				zero = append(zero, w.Measure)
			}
		}
		out = append(out, fmt.Sprintf("In the weighting that shows %s in its best light, its %s count as %s of the total.", u.Name, what, list(items)))
		if len(zero) > 0 {
			verb := "gets"
			if len(zero) > 1 {
				verb = "get"
			}
			out = append(out, fmt.Sprintf("%s %s no weight: in this weighting the score does not depend on it.", list(zero), verb))
		}
	}
	side(u.InputW, "inputs")
	side(u.OutputW, "outputs")
	return out
}

func scale(u dea.UnitResult) []string {
	if u.ScaleClass == "" {
		return nil
	}
	out := []string{fmt.Sprintf("Under constant returns to scale its score is %s, under variable returns %s; its scale efficiency is %s.",
		Percent(u.ScoreCRS), Percent(u.ScoreVRS), Percent(u.ScaleEff))}
	switch u.ScaleClass {
	case dea.ScaleIncreasing:
		out = append(out, "It operates at increasing returns to scale: it is smaller than its most productive size, and growing would raise its productivity.")
	case dea.ScaleDecreasing:
		out = append(out, "It operates at decreasing returns to scale: it is larger than its most productive size, and its extra size lowers its productivity.")
	case dea.ScaleConstant:
		out = append(out, "It operates at constant returns to scale: at its most productive size.")
	}
	return out
}

func super(u dea.UnitResult, m dea.Model) []string {
	if !m.Super {
		return nil
	}
	if u.Super == nil {
		note := u.SuperNote
		if note == "" {
			note = "the model has no solution when the unit is compared with the others only"
		}
		return []string{fmt.Sprintf("No super-efficiency score exists for %s: %s.", u.Name, strings.TrimSuffix(note, "."))}
	}
	s := *u.Super
	first := fmt.Sprintf("Its super-efficiency score, against the other units only (Andersen & Petersen 1993), is %s.", Percent(s))
	if s <= 1+small {
		return []string{first + " It is not on the frontier, so this equals its score."}
	}
	if m.Orientation == dea.Output {
		return []string{first + fmt.Sprintf(" Its outputs could fall by %s and it would still be on the frontier.", Percent(1-1/s))}
	}
	return []string{first + fmt.Sprintf(" It could use %s more of every input and still be on the frontier.", Percent(s-1))}
}

func check(u dea.UnitResult) []string {
	c := u.Cert
	worst := math.Max(c.PrimalError, math.Max(c.DualError, c.Gap))
	if c.Verified {
		return []string{fmt.Sprintf("Verified: an independent check of the solution found it consistent (largest error %.1e, within the tolerance %.1e).", worst, c.Tolerance)}
	}
	return []string{fmt.Sprintf("Not verified: the independent check found an error of %.1e, above the tolerance %.1e. Treat this score with care.", worst, c.Tolerance)}
}
