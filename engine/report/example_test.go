package report_test

import (
	"fmt"

	"peerlens/engine/dea"
	"peerlens/engine/report"
)

func ExampleUnit() {
	u := dea.UnitResult{
		Name: "Northgate", Score: 0.8, Status: dea.Inefficient,
		Peers:   []dea.Peer{{Index: 0, Name: "Ashby", Lambda: 0.4}, {Index: 2, Name: "Cray", Lambda: 0.6}},
		Inputs:  []dea.Target{{Measure: "Staff", Value: 20, Radial: 4, Target: 16, Change: -20}},
		Outputs: []dea.Target{{Measure: "Visits", Value: 1000, Target: 1000}},
		Cert:    dea.Certificate{Verified: true, Tolerance: 1e-7},
	}
	r := report.Unit(u, dea.Model{Returns: dea.Constant, Orientation: dea.Input})
	fmt.Println(r.Summary)
	fmt.Println(r.Sections[0].Sentences[0])
	fmt.Println(r.Sections[1].Sentences[0])
	// Output:
	// Northgate could produce its current outputs with 80% of its inputs: 20% less of every input; its score is 80%.
	// Staff: 20 today, target 16 (-20%): 4 less from the proportional change.
	// Northgate is compared with 2 peers: Ashby (weight 0.4) and Cray (weight 0.6). Its targets are this weighted combination of their inputs and outputs.
}
