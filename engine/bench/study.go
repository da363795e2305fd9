package bench

import (
	"peerlens/engine/dea"
	"peerlens/engine/study"
)

// Study is the study Generate(c) describes, in the form the page loads and
// runs: every unit included, the generated inputs and outputs as measures
// with those roles, and model m as its settings. Browser runs use it.
func Study(c Config, m dea.Model) *study.Study {
	d := Generate(c)
	s := &study.Study{Format: study.FormatVersion, Title: "Generated study", Units: d.Units, Settings: m}
	for _, name := range d.InputNames {
		s.Measures = append(s.Measures, study.NewMeasure(name, study.Input))
	}
	for _, name := range d.OutputNames {
		s.Measures = append(s.Measures, study.NewMeasure(name, study.Output))
	}
	s.Values = make([][]float64, len(d.Units))
	for j := range s.Values {
		s.Values[j] = append(append(make([]float64, 0, len(d.X[j])+len(d.Y[j])), d.X[j]...), d.Y[j]...)
	}
	return s
}
