//go:build js && wasm

package main

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math"

	"github.com/hack-pad/safejs"

	"peerlens/wasm/api"
	js "peerlens/wasm/internal/jsbridge"
)

// GlobalName is the name of the object register puts on globalThis.
const GlobalName = "peerlensEngine"

// register puts the engine's functions on globalThis.
func register() error {
	return js.Register(GlobalName, map[string]js.Handler{
		"parse":         parse,
		"parseBytes":    parseBytes,
		"parseRecords":  parseRecords,
		"demo":          func([]safejs.Value) (any, error) { return js.FromJSON(api.Demo()) },
		"validate":      validate,
		"run":           run,
		"runJSON":       runJSON,
		"frontier":      frontier,
		"frontierParts": frontierParts,
		"frontierPart":  frontierPart,
		"frontierCheck": frontierCheck,
		"explain":       explain,
		"describe":      describe,
		"exportCSV":     exportCSV,
		"version":       func([]safejs.Value) (any, error) { return api.Version, nil },
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

// run(study, onProgress, units, frontier, part, parts): onProgress(done,
// total, {done, total}) is called now and then; units (optional) restricts
// the run to those units; frontier (optional) is the candidate set
// frontier(study) (or frontierPart and frontierCheck) returned, so that
// workers sharing one run do not each compute it; part of parts (optional,
// parts above 1) makes this run one of parts shares, which merged are
// identical to one whole run (api.Share).
func run(args []safejs.Value) (any, error) {
	return js.FromJSON(runShare(args))
}

// runJSON takes the arguments of run and returns the result as the bytes
// of its JSON text in a Uint8Array. A large result crosses from a worker to
// the page much faster this way (the buffer is handed over, not copied,
// and JSON.parse on the page is quicker than cloning the objects).
func runJSON(args []safejs.Value) (any, error) {
	b, err := runShare(args)
	if err != nil {
		return nil, err
	}
	return js.Bytes(b)
}

// runShare reads the arguments of run and runs.
func runShare(args []safejs.Value) ([]byte, error) {
	s, err := js.JSONArg(args, 0)
	if err != nil {
		return nil, err
	}
	var sh api.Share
	if sh.Units, err = intsArg(args, 2, "the list of units"); err != nil {
		return nil, err
	}
	if sh.Frontier, err = intsArg(args, 3, "the frontier"); err != nil {
		return nil, err
	}
	if sh.Frontier == nil && js.Given(args, 3) {
		sh.Frontier = []int{} // an empty list given is an error, not "work it out"
	}
	if js.Given(args, 4) || js.Given(args, 5) {
		if sh.Part, err = intArg(args, 4, "the share of the run"); err != nil {
			return nil, err
		}
		if sh.Parts, err = intArg(args, 5, "the number of shares of the run"); err != nil {
			return nil, err
		}
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
	return api.RunShare(context.Background(), s, sh, progress)
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

// intArg reads a required whole number.
func intArg(args []safejs.Value, i int, what string) (int, error) {
	v := js.Arg(args, i)
	if v.Type() != safejs.TypeNumber {
		return 0, fmt.Errorf("%s must be a number (argument %d)", what, i+1)
	}
	f, err := v.Float()
	if err != nil {
		return 0, err
	}
	if f != math.Trunc(f) || math.Abs(f) > 1<<31 {
		return 0, fmt.Errorf("%s must be a whole number, not %v (argument %d)", what, f, i+1)
	}
	return int(f), nil
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

// frontierParts(study) returns {parts, sizes, units}: how many independent
// parts the search for frontier units has, how many units each covers, and
// how many units are included.
func frontierParts(args []safejs.Value) (any, error) {
	s, err := js.JSONArg(args, 0)
	if err != nil {
		return nil, err
	}
	return js.FromJSON(api.FrontierParts(s))
}

// frontierPart(study, p) returns {candidates}: the candidates of part p
// (from 0), indices into the included units in increasing order.
func frontierPart(args []safejs.Value) (any, error) {
	s, err := js.JSONArg(args, 0)
	if err != nil {
		return nil, err
	}
	p, err := intArg(args, 1, "the part of the search")
	if err != nil {
		return nil, err
	}
	return js.FromJSON(api.FrontierPart(context.Background(), s, p))
}

// frontierCheck(study, pool, lo, hi) returns {kept}: the units of
// pool[lo:hi] that stay candidates against all of pool, the candidates of
// every part in increasing order. Joined in order over consecutive pieces
// of pool, the answers are the study's candidate set.
func frontierCheck(args []safejs.Value) (any, error) {
	s, err := js.JSONArg(args, 0)
	if err != nil {
		return nil, err
	}
	pool, err := intsArg(args, 1, "the pool of candidates")
	if err != nil {
		return nil, err
	}
	if pool == nil {
		return nil, errors.New("the pool of candidates is missing (argument 2)")
	}
	lo, err := intArg(args, 2, "the start of the piece to check")
	if err != nil {
		return nil, err
	}
	hi, err := intArg(args, 3, "the end of the piece to check")
	if err != nil {
		return nil, err
	}
	return js.FromJSON(api.FrontierCheck(context.Background(), s, pool, lo, hi))
}
