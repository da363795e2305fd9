//go:build js && wasm

// Package jsbridge holds what the WebAssembly modules share to talk to
// JavaScript: registering a global object of functions, reading arguments
// (text, bytes, JSON via JSON.stringify), returning JSON payloads via
// JSON.parse, and turning every error and panic into {error: message} so a
// module never crashes. All access to syscall/js goes through
// github.com/hack-pad/safejs; small Go values become JavaScript values with
// github.com/norunners/vert.
package jsbridge

import (
	"errors"
	"fmt"
	"runtime/debug"

	"github.com/hack-pad/safejs"
	"github.com/norunners/vert"
)

// Handler is one bridge function: JavaScript arguments in, a value for
// JavaScript (or an error) out.
type Handler func(args []safejs.Value) (any, error)

// Register puts an object with the given functions on globalThis under
// name. Each function is wrapped by Guard.
func Register(name string, fns map[string]Handler) error {
	obj, err := safejs.ValueOf(map[string]any{})
	if err != nil {
		return err
	}
	for fn, h := range fns {
		f, err := safejs.FuncOf(Guard(fn, h))
		if err != nil {
			return err
		}
		if err := obj.Set(fn, f.Value()); err != nil {
			return err
		}
	}
	return safejs.Global().Set(name, obj)
}

// errorReply is what a failed call returns to JavaScript.
type errorReply struct {
	Error string `js:"error"`
}

// Guard turns a handler into a JavaScript function that never throws into
// the Go runtime: errors and panics become {error: message}.
func Guard(name string, h Handler) func(safejs.Value, []safejs.Value) any {
	return func(_ safejs.Value, args []safejs.Value) (out any) {
		defer func() {
			if p := recover(); p != nil {
				out = Failure(fmt.Errorf("internal error in %s: %v\n%s", name, p, debug.Stack()))
			}
		}()
		v, err := h(args)
		if err != nil {
			return Failure(err)
		}
		return v
	}
}

// Failure is the {error: message} object for err.
func Failure(err error) any {
	return safejs.Safe(vert.ValueOf(errorReply{Error: err.Error()}).JSValue())
}

// ToJS converts a small Go value (structs with js tags, slices, maps,
// numbers, strings) to a JavaScript value field by field.
func ToJS(v any) safejs.Value { return safejs.Safe(vert.ValueOf(v).JSValue()) }

// FromJS assigns a JavaScript value to the Go value p points to.
func FromJS(v safejs.Value, p any) error { return vert.ValueOf(safejs.Unsafe(v)).AssignTo(p) }

// Arg returns argument i, or undefined.
func Arg(args []safejs.Value, i int) safejs.Value {
	if i < len(args) {
		return args[i]
	}
	return safejs.Undefined()
}

// Given reports whether argument i is neither undefined nor null.
func Given(args []safejs.Value, i int) bool {
	v := Arg(args, i)
	return !v.IsUndefined() && !v.IsNull()
}

// ErrMissing is returned for a required argument that is absent.
var ErrMissing = errors.New("a required argument is missing")

// JSONArg returns argument i as JSON text: a string is taken as JSON
// already, anything else goes through JSON.stringify.
func JSONArg(args []safejs.Value, i int) ([]byte, error) {
	if !Given(args, i) {
		return nil, fmt.Errorf("%w (argument %d)", ErrMissing, i+1)
	}
	v := Arg(args, i)
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

// FromJSON turns JSON text into a JavaScript value with JSON.parse, which is
// much faster than building a large result field by field.
func FromJSON(b []byte, err error) (any, error) {
	if err != nil {
		return nil, err
	}
	j, err := safejs.Global().Get("JSON")
	if err != nil {
		return nil, err
	}
	return j.Call("parse", string(b))
}

// StringArg returns argument i, which must be a string.
func StringArg(args []safejs.Value, i int) (string, error) {
	v := Arg(args, i)
	if v.Type() != safejs.TypeString {
		return "", fmt.Errorf("argument %d must be text", i+1)
	}
	return v.String()
}

// BytesArg copies argument i, a Uint8Array, into Go.
func BytesArg(args []safejs.Value, i int) ([]byte, error) {
	v := Arg(args, i)
	if v.Type() != safejs.TypeObject {
		return nil, fmt.Errorf("argument %d must be a Uint8Array", i+1)
	}
	n, err := v.Length()
	if err != nil {
		return nil, fmt.Errorf("argument %d must be a Uint8Array", i+1)
	}
	b := make([]byte, n)
	if _, err := safejs.CopyBytesToGo(b, v); err != nil {
		return nil, fmt.Errorf("argument %d must be a Uint8Array: %w", i+1, err)
	}
	return b, nil
}

// Bytes copies b into a new Uint8Array.
func Bytes(b []byte) (safejs.Value, error) {
	ctor, err := safejs.Global().Get("Uint8Array")
	if err != nil {
		return safejs.Undefined(), err
	}
	arr, err := ctor.New(len(b))
	if err != nil {
		return safejs.Undefined(), err
	}
	_, err = safejs.CopyBytesToJS(arr, b)
	return arr, err
}

// JSONArgs returns the first n arguments as JSON text (see JSONArg).
func JSONArgs(args []safejs.Value, n int) ([][]byte, error) {
	out := make([][]byte, n)
	for i := range out {
		b, err := JSONArg(args, i)
		if err != nil {
			return nil, err
		}
		out[i] = b
	}
	return out, nil
}

// ErrorOf returns the message of an {error: message} reply, or "".
func ErrorOf(v safejs.Value) string {
	if v.Type() != safejs.TypeObject {
		return ""
	}
	e, err := v.Get("error")
	if err != nil || e.Type() != safejs.TypeString {
		return ""
	}
	s, _ := e.String()
	return s
}
