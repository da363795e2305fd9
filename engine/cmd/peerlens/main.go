// Command peerlens runs a DEA model on a table or a study file, for batch use
// and for checking the engine from the command line.
//
//	go run ./engine/cmd/peerlens -data units.csv -inputs Staff,Budget -outputs Visits \
//	    [-rts crs|vrs|nirs|ndrs|bounded -lower L -upper U] [-orientation input|output] \
//	    [-super] [-slacks=false] [-json]
//	go run ./engine/cmd/peerlens -study study.json [-json]
//
// It writes CSV to standard output by default, or with -json one object whose
// "units" array holds one object per unit (name, score, status, peers,
// verified, targets, weights, ...). With -super, "score" is the
// super-efficiency score (it may exceed 1, and is null where no finite value
// exists) and "radialScore" the ordinary one. Problems go to standard error
// with a non-zero exit status.
package main

import (
	"context"
	"encoding/csv"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"

	"peerlens/engine/dea"
	"peerlens/engine/table"
)

func main() {
	if err := run(os.Args[1:], os.Stdout); err != nil {
		fmt.Fprintln(os.Stderr, "peerlens:", err)
		os.Exit(1)
	}
}

func run(args []string, out io.Writer) error {
	fs := flag.NewFlagSet("peerlens", flag.ContinueOnError)
	data := fs.String("data", "", "table file (CSV, semicolon-separated or tab-separated text)")
	studyFile := fs.String("study", "", "study file (JSON) instead of -data")
	inputs := fs.String("inputs", "", "comma-separated input column names")
	outputs := fs.String("outputs", "", "comma-separated output column names")
	rts := fs.String("rts", "vrs", "returns to scale: crs, vrs, nirs, ndrs or bounded")
	lower := fs.Float64("lower", 0, "lower bound on the sum of lambdas (with -rts bounded)")
	upper := fs.Float64("upper", 0, "upper bound on the sum of lambdas (with -rts bounded; 0 = none)")
	orient := fs.String("orientation", "input", "input or output")
	super := fs.Bool("super", false, "report super-efficiency scores (Andersen & Petersen 1993)")
	slacks := fs.Bool("slacks", true, "second stage: maximise slacks with the score fixed")
	asJSON := fs.Bool("json", false, "write JSON instead of CSV")
	if err := fs.Parse(args); err != nil {
		return err
	}
	var (
		d   *dea.Data
		m   dea.Model
		err error
	)
	switch {
	case *studyFile != "" && *data != "":
		return errors.New("give either -data or -study, not both")
	case *studyFile != "":
		d, m, err = loadStudy(*studyFile)
		if err != nil {
			return err
		}
		m.Super = m.Super || *super
	case *data != "":
		m = dea.Model{Orientation: dea.Orientation(*orient), SecondStage: *slacks, Super: *super, ScaleDetail: true, Lower: *lower, Upper: *upper}
		if m.Returns, err = parseReturns(*rts); err != nil {
			return err
		}
		if err = m.Validate(); err != nil {
			return err
		}
		d, err = loadTable(*data, splitNames(*inputs), splitNames(*outputs))
		if err != nil {
			return err
		}
	default:
		return errors.New("give -data FILE with -inputs and -outputs, or -study FILE")
	}
	res, err := dea.Run(context.Background(), d, m, nil)
	if err != nil {
		return err
	}
	if *asJSON {
		return writeJSON(out, res, m.Super)
	}
	return writeCSV(out, d, res, m.Super)
}

func splitNames(s string) []string {
	var out []string
	for _, f := range strings.Split(s, ",") {
		if f = strings.TrimSpace(f); f != "" {
			out = append(out, f)
		}
	}
	return out
}

func parseReturns(s string) (dea.Returns, error) {
	switch strings.ToLower(s) {
	case "crs", "constant":
		return dea.Constant, nil
	case "vrs", "variable":
		return dea.Variable, nil
	case "nirs", "non-increasing":
		return dea.NonIncreasing, nil
	case "ndrs", "non-decreasing":
		return dea.NonDecreasing, nil
	case "bounded":
		return dea.Bounded, nil
	}
	return "", fmt.Errorf("unknown -rts %q: use crs, vrs, nirs, ndrs or bounded", s)
}

// loadTable reads a table file and picks the named columns. Every unreadable
// or missing cell in a chosen column is an error naming its row and column.
func loadTable(path string, inputs, outputs []string) (*dea.Data, error) {
	if len(inputs) == 0 || len(outputs) == 0 {
		return nil, errors.New("name at least one input (-inputs) and one output (-outputs)")
	}
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	t, err := table.ParseBytes(b)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	find := func(name string) (int, error) {
		for j, h := range t.Header {
			if strings.EqualFold(strings.TrimSpace(h), name) {
				return j, nil
			}
		}
		return -1, fmt.Errorf("%s: no column named %q (columns: %s)", path, name, strings.Join(t.Header, ", "))
	}
	pick := func(names []string) ([]int, error) {
		var cols []int
		for _, n := range names {
			j, err := find(n)
			if err != nil {
				return nil, err
			}
			if !t.Columns[j].Numeric {
				return nil, fmt.Errorf("%s: column %q does not hold numbers", path, n)
			}
			cols = append(cols, j)
		}
		return cols, nil
	}
	ic, err := pick(inputs)
	if err != nil {
		return nil, err
	}
	oc, err := pick(outputs)
	if err != nil {
		return nil, err
	}
	d := &dea.Data{InputNames: inputs, OutputNames: outputs}
	var problems []string
	row := func(k int, cols []int) []float64 {
		v := make([]float64, len(cols))
		for i, j := range cols {
			v[i] = t.Columns[j].Values[k]
			if math.IsNaN(v[i]) {
				problems = append(problems, fmt.Sprintf("row %d, column %d (%s): %q is not a usable number", t.Rows[k].Line, j+1, t.Header[j], t.Rows[k].Cells[j]))
			}
		}
		return v
	}
	for k, r := range t.Rows {
		name := fmt.Sprintf("Unit %d", k+1)
		if t.NameColumn >= 0 {
			name = strings.TrimSpace(r.Cells[t.NameColumn])
		}
		d.Units = append(d.Units, name)
		d.X = append(d.X, row(k, ic))
		d.Y = append(d.Y, row(k, oc))
	}
	if len(problems) > 0 {
		return nil, fmt.Errorf("%s: %d cells cannot be used:\n  %s", path, len(problems), strings.Join(problems, "\n  "))
	}
	return d, nil
}

func writeJSON(out io.Writer, res *dea.Result, super bool) error {
	raw, err := json.Marshal(res)
	if err != nil {
		return err
	}
	var obj map[string]any
	if err := json.Unmarshal(raw, &obj); err != nil {
		return err
	}
	if super {
		units := obj["units"].([]any)
		for k, u := range res.Units {
			o := units[k].(map[string]any)
			o["radialScore"] = o["score"]
			if u.Super != nil {
				o["score"] = *u.Super
			} else {
				o["score"] = nil
			}
		}
	}
	enc := json.NewEncoder(out)
	enc.SetIndent("", " ")
	return enc.Encode(obj)
}

func writeCSV(out io.Writer, d *dea.Data, res *dea.Result, super bool) error {
	w := csv.NewWriter(out)
	head := []string{"unit", "score", "status", "verified", "peers", "scale efficiency", "returns to scale"}
	if super {
		head = append(head, "super-efficiency")
	}
	for _, n := range d.InputNames {
		head = append(head, "target "+n, "slack "+n)
	}
	for _, n := range d.OutputNames {
		head = append(head, "target "+n, "slack "+n)
	}
	if err := w.Write(head); err != nil {
		return err
	}
	f := func(v float64) string {
		if math.IsNaN(v) {
			return ""
		}
		return strconv.FormatFloat(v, 'g', 10, 64)
	}
	for _, u := range res.Units {
		var peers []string
		for _, p := range u.Peers {
			peers = append(peers, fmt.Sprintf("%s (%s)", p.Name, f(p.Lambda)))
		}
		rec := []string{u.Name, f(u.Score), string(u.Status), strconv.FormatBool(u.Cert.Verified), strings.Join(peers, "; "), f(u.ScaleEff), string(u.ScaleClass)}
		if super {
			s := ""
			if u.Super != nil {
				s = f(*u.Super)
			}
			rec = append(rec, s)
		}
		for _, t := range append(append([]dea.Target(nil), u.Inputs...), u.Outputs...) {
			rec = append(rec, f(t.Target), f(t.Slack))
		}
		if err := w.Write(rec); err != nil {
			return err
		}
	}
	w.Flush()
	return w.Error()
}
