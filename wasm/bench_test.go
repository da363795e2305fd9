//go:build js && wasm

package main

import (
	"encoding/json"
	"testing"

	"github.com/norunners/vert"

	"peerlens/engine/dea"
	"peerlens/engine/export"
	js "peerlens/wasm/internal/jsbridge"
)

// bigResult repeats the demo's unit results to n units.
func bigResult(b *testing.B, n int) *dea.Result {
	_, r := nativeDemo(b)
	big := &dea.Result{Model: r.Model, Units: make([]dea.UnitResult, n)}
	for i := range big.Units {
		big.Units[i] = r.Units[i%len(r.Units)]
		big.Units[i].Index = i
	}
	return big
}

// How a large result is best handed to JavaScript: as JSON text parsed by
// JSON.parse (what the bridge does) or built field by field with vert.
func BenchmarkResultToJS(b *testing.B) {
	r := bigResult(b, 10000)
	b.Run("json-parse", func(b *testing.B) {
		for b.Loop() {
			data, err := export.JSON(r)
			if err != nil {
				b.Fatal(err)
			}
			if _, err := js.FromJSON(data, nil); err != nil {
				b.Fatal(err)
			}
		}
	})
	data, _ := export.JSON(r)
	b.Run("encode-only", func(b *testing.B) {
		for b.Loop() {
			if _, err := export.JSON(r); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("encoding-json-only", func(b *testing.B) {
		for b.Loop() {
			if _, err := json.Marshal(r); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("parse-only", func(b *testing.B) {
		for b.Loop() {
			if _, err := js.FromJSON(data, nil); err != nil {
				b.Fatal(err)
			}
		}
	})
	// vert cannot take dea.Result itself (it panics on named string types
	// such as dea.Status and names omitempty fields "name,omitempty"), so
	// it gets the same values as plain maps and slices: this measures
	// building the JavaScript objects field by field.
	var plain any
	if err := json.Unmarshal(data, &plain); err != nil {
		b.Fatal(err)
	}
	b.Run("vert-plain", func(b *testing.B) {
		for b.Loop() {
			_ = vert.ValueOf(plain)
		}
	})
}
