//go:build js && wasm

package main

import (
	"context"
	"encoding/json"
	"strings"
	"testing"

	"github.com/hack-pad/safejs"

	"peerlens/engine/study"
	"peerlens/wasm/api"
	js "peerlens/wasm/internal/jsbridge"
)

func sheets(t *testing.T) safejs.Value {
	t.Helper()
	if err := register(); err != nil {
		t.Fatal(err)
	}
	g, err := safejs.Global().Get(GlobalName)
	if err != nil {
		t.Fatal(err)
	}
	return g
}

// write gives a Uint8Array holding a workbook that read gives back: the
// Results sheet first, one row per demo unit.
func TestWriteAndReadThroughJS(t *testing.T) {
	g := sheets(t)
	sj, _ := api.Demo()
	rj, err := api.Run(context.Background(), sj, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	wb, err := g.Call("write", string(sj), string(rj), "2026-05-06T07:08:00Z")
	if err != nil {
		t.Fatal(err)
	}
	if e := js.ErrorOf(wb); e != "" {
		t.Fatal(e)
	}
	n, _ := wb.Length()
	if n < 1000 {
		t.Fatalf("workbook of %d bytes", n)
	}
	got, err := g.Call("read", wb)
	if err != nil {
		t.Fatal(err)
	}
	if e := js.ErrorOf(got); e != "" {
		t.Fatal(e)
	}
	sheet, _ := got.Get("sheet")
	if s, _ := sheet.String(); s != "Results" {
		t.Errorf("sheet %q, want Results", s)
	}
	recsText, _ := got.Get("records")
	text, _ := recsText.String()
	var recs [][]string
	if err := json.Unmarshal([]byte(text), &recs); err != nil {
		t.Fatal(err)
	}
	demo := study.Demo()
	if len(recs) != len(demo.Units)+1 || recs[1][0] != demo.Units[0] {
		t.Errorf("records %d rows, first unit %q", len(recs), recs[1][0])
	}
}

func TestErrorsAreMessages(t *testing.T) {
	g := sheets(t)
	junk, _ := safejs.ValueOf([]any{1, 2, 3})
	for _, tc := range []struct {
		fn   string
		args []any
		want string
	}{
		{"read", nil, "Uint8Array"},
		{"read", []any{"text"}, "Uint8Array"},
		{"write", []any{"{}"}, "missing"},
		{"write", []any{"{}", "{}", "yesterday"}, ""},
		{"read", []any{junk}, ""},
	} {
		v, err := g.Call(tc.fn, tc.args...)
		if err != nil {
			t.Fatalf("%s threw: %v", tc.fn, err)
		}
		if e := js.ErrorOf(v); e == "" || !strings.Contains(e, tc.want) {
			t.Errorf("%s(%v) error %q, want one containing %q", tc.fn, tc.args, e, tc.want)
		}
	}
}
