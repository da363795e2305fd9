//go:build js && wasm

package main

import (
	"context"
	"errors"
	"fmt"
	"runtime/debug"

	"github.com/hack-pad/safejs"
	"github.com/norunners/vert"

	"peerlens/wasm/api"
)

// GlobalName is the name of the object register puts on globalThis.
const GlobalName = "peerlensEngine"

// handler is one bridge function: JavaScript arguments in, a JavaScript
// value (or an error) out.
type handler func(args []safejs.Value) (any, error)

// register puts the engine's functions on globalThis.
func register() error {
	obj, err := safejs.ValueOf(map[string]any{})
	if err != nil {
		return err
	}
	fns := map[string]handler{
		"parse":        parse,
		"parseBytes":   parseBytes,
		"parseRecords": parseRecords,
		"demo":         func([]safejs.Value) (any, error) { return fromJSON(api.Demo()) },
		"validate":     validate,
		"run":          run,
		"explain":      explain,
		"describe":     describe,
		"exportCSV":    exportCSV,
		"version":      func([]safejs.Value) (any, error) { return api.Version, nil },
	}
	for name, h := range fns {
		f, err := safejs.FuncOf(guard(name, h))
		if err != nil {
			return err
		}
		if err := obj.Set(name, f.Value()); err != nil {
			return err
		}
	}
	return safejs.Global().Set(GlobalName, obj)
}

// errorReply is what a failed call returns to JavaScript.
type errorReply struct {
	Error string `js:"error"`
}

// guard turns a handler into a JavaScript function that never throws into
// the Go runtime: errors and panics become {error: message}.
func guard(name string, h handler) func(safejs.Value, []safejs.Value) any {
	return func(_ safejs.Value, args []safejs.Value) (out any) {
		defer func() {
			if p := recover(); p != nil {
				out = failure(fmt.Errorf("internal error in %s: %v\n%s", name, p, debug.Stack()))
			}
		}()
		v, err := h(args)
		if err != nil {
			return failure(err)
		}
		return v
	}
}

func failure(err error) any {
	return safejs.Safe(vert.ValueOf(errorReply{Error: err.Error()}).JSValue())
}

// arg returns argument i, or undefined.
func arg(args []safejs.Value, i int) safejs.Value {
	if i < len(args) {
		return args[i]
	}
	return safejs.Undefined()
}

var errMissing = errors.New("a required argument is missing")

// jsonArg returns argument i as JSON text (JSON.stringify).
func jsonArg(args []safejs.Value, i int) ([]byte, error) {
	v := arg(args, i)
	if v.IsUndefined() || v.IsNull() {
		return nil, fmt.Errorf("%w (argument %d)", errMissing, i+1)
	}
	if v.Type() == safejs.TypeString {
		s, err := v.String()
		return []byte(s), err
	}
	j, err := safejs.Global().Get("JSON")
	if err != nil {
		return nil, err
	}
	s, err := j.Call("stringify", v)
	if err != nil {
		return nil, err
	}
	str, err := s.String()
	return []byte(str), err
}

// fromJSON turns JSON text made by package api into a JavaScript value
// (JSON.parse), which is much faster than building it field by field for
// large results.
func fromJSON(b []byte, err error) (any, error) {
	if err != nil {
		return nil, err
	}
	j, err := safejs.Global().Get("JSON")
	if err != nil {
		return nil, err
	}
	return j.Call("parse", string(b))
}

func stringArg(args []safejs.Value, i int) (string, error) {
	v := arg(args, i)
	if v.Type() != safejs.TypeString {
		return "", fmt.Errorf("argument %d must be text", i+1)
	}
	return v.String()
}

func parse(args []safejs.Value) (any, error) {
	text, err := stringArg(args, 0)
	if err != nil {
		return nil, err
	}
	return fromJSON(api.Parse(text))
}

// bytesArg copies a Uint8Array argument into Go.
func bytesArg(args []safejs.Value, i int) ([]byte, error) {
	v := arg(args, i)
	n, err := v.Length()
	if err != nil || v.Type() != safejs.TypeObject {
		return nil, fmt.Errorf("argument %d must be a Uint8Array", i+1)
	}
	b := make([]byte, n)
	if _, err := safejs.CopyBytesToGo(b, v); err != nil {
		return nil, fmt.Errorf("argument %d must be a Uint8Array: %w", i+1, err)
	}
	return b, nil
}

func parseBytes(args []safejs.Value) (any, error) {
	b, err := bytesArg(args, 0)
	if err != nil {
		return nil, err
	}
	return fromJSON(api.ParseBytes(b))
}

func parseRecords(args []safejs.Value) (any, error) {
	var records [][]string
	if err := vert.ValueOf(safejs.Unsafe(arg(args, 0))).AssignTo(&records); err != nil {
		return nil, fmt.Errorf("the cells could not be read: %w", err)
	}
	return fromJSON(api.ParseRecords(records))
}

func validate(args []safejs.Value) (any, error) {
	s, err := jsonArg(args, 0)
	if err != nil {
		return nil, err
	}
	return fromJSON(api.Validate(s))
}

// progressStep is how often (in units) progress is reported at most: about
// every half per cent of the run, so a large run does not spend its time
// posting messages.
func progressStep(total int) int { return max(1, total/200) }

type progressReply struct {
	Done  int `js:"done"`
	Total int `js:"total"`
}

func run(args []safejs.Value) (any, error) {
	s, err := jsonArg(args, 0)
	if err != nil {
		return nil, err
	}
	cb := arg(args, 1)
	var units []int
	if u := arg(args, 2); !u.IsUndefined() && !u.IsNull() {
		if err := vert.ValueOf(safejs.Unsafe(u)).AssignTo(&units); err != nil {
			return nil, fmt.Errorf("the list of units could not be read: %w", err)
		}
	}
	var progress func(done, total int)
	if cb.Type() == safejs.TypeFunction {
		last := 0
		progress = func(done, total int) {
			if done != total && done-last < progressStep(total) {
				return
			}
			last = done
			p := safejs.Safe(vert.ValueOf(progressReply{Done: done, Total: total}).JSValue())
			_, _ = cb.Invoke(done, total, p) // a failing callback does not stop the run
		}
	}
	return fromJSON(api.Run(context.Background(), s, units, progress))
}

func explain(args []safejs.Value) (any, error) {
	m, err := jsonArg(args, 0)
	if err != nil {
		return nil, err
	}
	u, err := jsonArg(args, 1)
	if err != nil {
		return nil, err
	}
	return fromJSON(api.Explain(m, u))
}

func describe(args []safejs.Value) (any, error) {
	m, err := jsonArg(args, 0)
	if err != nil {
		return nil, err
	}
	return fromJSON(api.Describe(m))
}

func exportCSV(args []safejs.Value) (any, error) {
	s, err := jsonArg(args, 0)
	if err != nil {
		return nil, err
	}
	r, err := jsonArg(args, 1)
	if err != nil {
		return nil, err
	}
	return api.ExportCSV(s, r)
}
