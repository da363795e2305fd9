//go:build js && wasm

package main

import (
	"bytes"
	"context"
	"regexp"
	"strings"
	"testing"

	"github.com/hack-pad/safejs"

	"peerlens/engine/dea"
	"peerlens/engine/export"
	"peerlens/engine/report"
	"peerlens/engine/study"
	"peerlens/wasm/api"
	js "peerlens/wasm/internal/jsbridge"
)

// engine registers the bridge once and returns the global object.
func engine(t testing.TB) safejs.Value {
	t.Helper()
	g, err := safejs.Global().Get(GlobalName)
	if err != nil {
		t.Fatal(err)
	}
	if g.IsUndefined() {
		if err := register(); err != nil {
			t.Fatal(err)
		}
		g, _ = safejs.Global().Get(GlobalName)
	}
	return g
}

func call(t testing.TB, name string, args ...any) safejs.Value {
	t.Helper()
	v, err := engine(t).Call(name, args...)
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	return v
}

// stringify is JSON.stringify, as the page would see the value.
func stringify(t testing.TB, v safejs.Value) string {
	t.Helper()
	j, _ := safejs.Global().Get("JSON")
	s, err := j.Call("stringify", v)
	if err != nil {
		t.Fatal(err)
	}
	str, _ := s.String()
	return str
}

// nativeDemo runs the demo study with the engine directly, without the
// bridge.
func nativeDemo(t testing.TB) (*study.Study, *dea.Result) {
	t.Helper()
	s := study.Demo()
	d, _, err := s.Data()
	if err != nil {
		t.Fatal(err)
	}
	r, err := dea.Run(context.Background(), &d, s.Settings, nil)
	if err != nil {
		t.Fatal(err)
	}
	return s, r
}

// canonical writes a result the way the bridge does, so two results can be
// compared number for number (JSON text from JavaScript formats numbers its
// own way; reading it back gives the same float64 values).
func canonical(t testing.TB, resultJSON string) string {
	t.Helper()
	r, err := api.ReadResult([]byte(resultJSON))
	if err != nil {
		t.Fatal(err)
	}
	b, err := export.JSON(r)
	if err != nil {
		t.Fatal(err)
	}
	return noNegativeZero(string(b))
}

var negZero = regexp.MustCompile(`(^|[:,\[\n])-0([,}\]\n]|$)`)

// noNegativeZero writes -0 as 0. JSON.stringify writes the number -0 as 0,
// so a result that went through JavaScript has lost the sign of its zeros;
// the values are equal (-0 == 0).
func noNegativeZero(s string) string {
	for range 2 { // overlapping matches such as ",-0,-0,"
		s = negZero.ReplaceAllString(s, "${1}0${2}")
	}
	return s
}

func TestDemoRunMatchesNativeEngine(t *testing.T) {
	demo := call(t, "demo")
	if e := js.ErrorOf(demo); e != "" {
		t.Fatal(e)
	}
	s, err := api.ReadStudy([]byte(stringify(t, demo)))
	if err != nil {
		t.Fatal(err)
	}
	ns, nr := nativeDemo(t)
	if strings.Join(s.Units, "|") != strings.Join(ns.Units, "|") || len(s.Measures) != len(ns.Measures) {
		t.Fatalf("bridge demo differs from study.Demo()")
	}

	issues := call(t, "validate", demo)
	if n, _ := issues.Length(); n != len(study.Validate(ns)) {
		t.Errorf("validate gave %d issues, want %d", n, len(study.Validate(ns)))
	}

	var seen []int
	progress, err := safejs.FuncOf(func(_ safejs.Value, args []safejs.Value) any {
		d, _ := args[0].Int()
		total, _ := args[1].Int()
		obj, _ := args[2].Get("total")
		if n, _ := obj.Int(); n != total {
			t.Errorf("progress object total %d, argument %d", n, total)
		}
		seen = append(seen, d)
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	defer progress.Release()
	res := call(t, "run", demo, progress.Value())
	if e := js.ErrorOf(res); e != "" {
		t.Fatal(e)
	}
	if len(seen) == 0 || seen[len(seen)-1] != len(ns.Units) {
		t.Errorf("progress %v, want it to end at %d", seen, len(ns.Units))
	}
	wantJSON, _ := export.JSON(nr)
	want := noNegativeZero(string(wantJSON))
	if got := canonical(t, stringify(t, res)); got != want {
		i := 0
		for i < len(got) && i < len(want) && got[i] == want[i] {
			i++
		}
		lo := max(0, i-200)
		t.Errorf("bridge result differs from the native run at byte %d\n got %s\nwant %s", i, got[lo:min(len(got), i+100)], want[lo:min(len(want), i+100)])
	}

	// explain(model, unit) for every unit is the native report.
	units, _ := res.Get("units")
	model, _ := res.Get("model")
	for k := range nr.Units {
		u, _ := units.Index(k)
		rep := call(t, "explain", model, u)
		if e := js.ErrorOf(rep); e != "" {
			t.Fatalf("explain %d: %s", k, e)
		}
		summary, _ := rep.Get("summary")
		got, _ := summary.String()
		if w := report.Unit(nr.Units[k], nr.Model).Summary; got != w {
			t.Errorf("explain %d = %q, want %q", k, got, w)
		}
	}

	csv := call(t, "exportCSV", demo, res)
	got, err := csv.String()
	if err != nil {
		t.Fatalf("exportCSV: %v (%s)", err, js.ErrorOf(csv))
	}
	var wantCSV bytes.Buffer
	if err := export.CSV(&wantCSV, ns, nr); err != nil {
		t.Fatal(err)
	}
	if noNegativeZero(got) != noNegativeZero(wantCSV.String()) {
		t.Error("bridge CSV differs from the native export")
	}
}

func TestParseAndRecords(t *testing.T) {
	p := call(t, "parse", "unit;staff;visits\nA;10;100\nB;12;x\n")
	if e := js.ErrorOf(p); e != "" {
		t.Fatal(e)
	}
	want, err := api.Parse("unit;staff;visits\nA;10;100\nB;12;x\n")
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if got := stringify(t, p); !sameJSON(t, got, string(want), &buf) {
		t.Errorf("parse = %s\nwant %s", got, want)
	}
	recs, _ := safejs.ValueOf([]any{[]any{"unit", "staff", "visits"}, []any{"A", "10", "100"}, []any{"B", "12", "x"}})
	r := call(t, "parseRecords", recs)
	if e := js.ErrorOf(r); e != "" {
		t.Fatal(e)
	}
	// The same cells as JSON text, the form the spreadsheet module sends.
	r2 := call(t, "parseRecords", `[["unit","staff","visits"],["A","10","100"],["B","12","x"]]`)
	if e := js.ErrorOf(r2); e != "" {
		t.Fatal(e)
	}
	st1, _ := p.Get("study")
	for _, v := range []safejs.Value{r, r2} {
		st2, _ := v.Get("study")
		if a, b := stringify(t, st1), stringify(t, st2); a != b {
			t.Errorf("records and text give different studies:\n%s\n%s", a, b)
		}
	}
	bytesArr, _ := js.Bytes([]byte("unit;staff;visits\nA;10;100\nB;12;x\n"))
	pb := call(t, "parseBytes", bytesArr)
	if got := stringify(t, pb); got != stringify(t, p) {
		t.Errorf("parseBytes = %s\nparse = %s", got, stringify(t, p))
	}
}

// sameJSON compares two JSON texts after both go through JSON.parse and
// JSON.stringify.
func sameJSON(t testing.TB, a, b string, _ *bytes.Buffer) bool {
	j, _ := safejs.Global().Get("JSON")
	pa, err := j.Call("parse", a)
	if err != nil {
		t.Fatal(err)
	}
	pb, err := j.Call("parse", b)
	if err != nil {
		t.Fatal(err)
	}
	return stringify(t, pa) == stringify(t, pb)
}

func TestSubsetRun(t *testing.T) {
	demo := call(t, "demo")
	units, _ := safejs.ValueOf([]any{2, 0})
	res := call(t, "run", demo, safejs.Null(), units)
	if e := js.ErrorOf(res); e != "" {
		t.Fatal(e)
	}
	_, nr := nativeDemo(t)
	us, _ := res.Get("units")
	if n, _ := us.Length(); n != 2 {
		t.Fatalf("%d units, want 2", n)
	}
	u0, _ := us.Index(0)
	name, _ := u0.Get("name")
	if s, _ := name.String(); s != nr.Units[2].Name {
		t.Errorf("first unit %q, want %q", s, nr.Units[2].Name)
	}
}

// Errors come back as {error: message}; nothing throws or crashes.
func TestErrorsComeBackAsMessages(t *testing.T) {
	junk, _ := safejs.ValueOf(map[string]any{"format": 1, "units": []any{"A"}, "measures": "nonsense"})
	for _, tc := range []struct {
		name string
		args []any
		want string
	}{
		{"parse", nil, "must be text"},
		{"parse", []any{42}, "must be text"},
		{"validate", nil, "missing"},
		{"validate", []any{junk}, ""},
		{"run", []any{junk}, ""},
		{"run", []any{"{\"format\":1,\"units\":[],\"measures\":[],\"values\":[]}"}, ""},
		{"explain", []any{"{}", "{not json"}, ""},
		{"exportCSV", []any{junk, junk}, ""},
		{"parseRecords", []any{42}, ""},
	} {
		v := call(t, tc.name, tc.args...)
		e := js.ErrorOf(v)
		if e == "" || !strings.Contains(e, tc.want) {
			t.Errorf("%s(%v) = %s, want an error containing %q", tc.name, tc.args, stringify(t, v), tc.want)
		}
	}
	// A panic inside a handler is recovered at the boundary.
	f := js.Guard("boom", func([]safejs.Value) (any, error) { panic("boom") })
	v := f(safejs.Undefined(), nil).(safejs.Value)
	if e := js.ErrorOf(v); !strings.Contains(e, "internal error in boom: boom") {
		t.Errorf("panic gave %q", e)
	}
}

// frontier(study), then run(study, null, units, frontier) on a share of the
// units, gives those units the scores of the whole run; a frontier that
// cannot belong to the study is refused with a message.
func TestFrontierThenSharedRun(t *testing.T) {
	demo := call(t, "demo")
	fs := call(t, "frontier", demo)
	if e := js.ErrorOf(fs); e != "" {
		t.Fatal(e)
	}
	front, _ := fs.Get("frontier")
	n, _ := fs.Get("units")
	_, nr := nativeDemo(t)
	if got, _ := n.Int(); got != len(nr.Units) {
		t.Fatalf("frontier says %d units, the demo has %d", got, len(nr.Units))
	}
	units, _ := safejs.ValueOf([]any{3, 1})
	res := call(t, "run", demo, safejs.Null(), units, front)
	if e := js.ErrorOf(res); e != "" {
		t.Fatal(e)
	}
	us, _ := res.Get("units")
	for k, j := range []int{3, 1} {
		u, _ := us.Index(k)
		sv, _ := u.Get("score")
		if s, _ := sv.Float(); s != nr.Units[j].Score {
			t.Errorf("unit %d: shared run score %v, whole run %v", j, s, nr.Units[j].Score)
		}
	}
	bad, _ := safejs.ValueOf([]any{0, 999})
	if e := js.ErrorOf(call(t, "run", demo, safejs.Null(), units, bad)); !strings.Contains(e, "frontier") {
		t.Errorf("a foreign frontier gave %q, want a message about the frontier", e)
	}
}
