//go:build js && wasm

package main

import (
	"context"
	"encoding/json"
	"fmt"

	"github.com/hack-pad/safejs"

	"peerlens/wasm/api"
	js "peerlens/wasm/internal/jsbridge"
)

// GlobalName is the name of the object register puts on globalThis.
const GlobalName = "peerlensEngine"

// register puts the engine's functions on globalThis.
func register() error {
	return js.Register(GlobalName, map[string]js.Handler{
		"parse":        parse,
		"parseBytes":   parseBytes,
		"parseRecords": parseRecords,
		"demo":         func([]safejs.Value) (any, error) { return js.FromJSON(api.Demo()) },
		"validate":     validate,
		"run":          run,
		"frontier":     frontier,
		"explain":      explain,
		"describe":     describe,
		"exportCSV":    exportCSV,
		"version":      func([]safejs.Value) (any, error) { return api.Version, nil },
	})
}

func parse(args []safejs.Value) (any, error) {
	text, err := js.StringArg(args, 0)
	if err != nil {
		return nil, err
	}
	return js.FromJSON(api.Parse(text))
}

func parseBytes(args []safejs.Value) (any, error) {
	b, err := js.BytesArg(args, 0)
	if err != nil {
		return nil, err
	}
	return js.FromJSON(api.ParseBytes(b))
}

// parseRecords takes the cells of a spreadsheet as an array of arrays of
// strings, or as that array in JSON text (faster for large sheets).
func parseRecords(args []safejs.Value) (any, error) {
	var records [][]string
	if js.Arg(args, 0).Type() == safejs.TypeString {
		b, err := js.JSONArg(args, 0)
		if err != nil {
			return nil, err
		}
		if err := json.Unmarshal(b, &records); err != nil {
			return nil, fmt.Errorf("the cells could not be read: %w", err)
		}
	} else if err := js.FromJS(js.Arg(args, 0), &records); err != nil || records == nil {
		return nil, fmt.Errorf("the cells could not be read: %v", err)
	}
	return js.FromJSON(api.ParseRecords(records))
}

func validate(args []safejs.Value) (any, error) {
	s, err := js.JSONArg(args, 0)
	if err != nil {
		return nil, err
	}
	return js.FromJSON(api.Validate(s))
}

// progressStep is how often (in units) progress is reported at most: about
// every half per cent of the run, so a large run does not spend its time
// posting messages.
func progressStep(total int) int { return max(1, total/200) }

type progressReply struct {
	Done  int `js:"done"`
	Total int `js:"total"`
}

// run(study, onProgress, units, frontier): onProgress(done, total, {done,
// total}) is called now and then; units (optional) restricts the run to
// those units; frontier (optional) is the candidate set frontier(study)
// returned, so that workers sharing one run do not each compute it.
func run(args []safejs.Value) (any, error) {
	s, err := js.JSONArg(args, 0)
	if err != nil {
		return nil, err
	}
	units, err := intsArg(args, 2, "the list of units")
	if err != nil {
		return nil, err
	}
	frontier, err := intsArg(args, 3, "the frontier")
	if err != nil {
		return nil, err
	}
	if frontier == nil && js.Given(args, 3) {
		frontier = []int{} // an empty list given is an error, not "work it out"
	}
	var progress func(done, total int)
	if cb := js.Arg(args, 1); cb.Type() == safejs.TypeFunction {
		last := 0
		progress = func(done, total int) {
			if done != total && done-last < progressStep(total) {
				return
			}
			last = done
			_, _ = cb.Invoke(done, total, js.ToJS(progressReply{Done: done, Total: total})) // a failing callback does not stop the run
		}
	}
	return js.FromJSON(api.RunPart(context.Background(), s, units, frontier, progress))
}

// intsArg reads an optional array of integers (nil when not given).
func intsArg(args []safejs.Value, i int, what string) ([]int, error) {
	if !js.Given(args, i) {
		return nil, nil
	}
	var v []int
	if err := js.FromJS(js.Arg(args, i), &v); err != nil {
		return nil, fmt.Errorf("%s could not be read: %w", what, err)
	}
	return v, nil
}

// frontier(study) returns {frontier, units}: the candidate set of the
// study's included units (indices into them) and how many are included.
func frontier(args []safejs.Value) (any, error) {
	s, err := js.JSONArg(args, 0)
	if err != nil {
		return nil, err
	}
	return js.FromJSON(api.Frontier(context.Background(), s))
}

func explain(args []safejs.Value) (any, error) {
	a, err := js.JSONArgs(args, 2)
	if err != nil {
		return nil, err
	}
	return js.FromJSON(api.Explain(a[0], a[1]))
}

func describe(args []safejs.Value) (any, error) {
	m, err := js.JSONArg(args, 0)
	if err != nil {
		return nil, err
	}
	return js.FromJSON(api.Describe(m))
}

func exportCSV(args []safejs.Value) (any, error) {
	a, err := js.JSONArgs(args, 2)
	if err != nil {
		return nil, err
	}
	return api.ExportCSV(a[0], a[1])
}
