//go:build js && wasm

package main

import (
	"bytes"
	"context"
	"math"
	"regexp"
	"slices"
	"strings"
	"testing"

	"github.com/hack-pad/safejs"

	"peerlens/engine/bench"
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
		// To rounding: a list of units that is not a union of the engine's
		// chunks can start each program from other columns (shares by part
		// are identical bit for bit; see TestSharedRunThroughBridge and the
		// dea tests).
		if s, _ := sv.Float(); math.Abs(s-nr.Units[j].Score) > 1e-12 {
			t.Errorf("unit %d: shared run score %v, whole run %v", j, s, nr.Units[j].Score)
		}
	}
	bad, _ := safejs.ValueOf([]any{0, 999})
	if e := js.ErrorOf(call(t, "run", demo, safejs.Null(), units, bad)); !strings.Contains(e, "frontier") {
		t.Errorf("a foreign frontier gave %q, want a message about the frontier", e)
	}
}

// generatedStudy is a generated study (engine/bench) as the JSON text the
// page sends.
func generatedStudy(t testing.TB, n int) string {
	t.Helper()
	var b bytes.Buffer
	if err := bench.Study(bench.Config{Units: n, Seed: 11}, dea.DefaultModel()).Write(&b); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

// ok calls name and fails the test on an {error} reply.
func ok(t testing.TB, name string, args ...any) safejs.Value {
	t.Helper()
	v := call(t, name, args...)
	if e := js.ErrorOf(v); e != "" {
		t.Fatalf("%s: %s", name, e)
	}
	return v
}

// ints reads a JavaScript array of numbers.
func ints(t testing.TB, v safejs.Value) []int {
	t.Helper()
	var out []int
	if err := js.FromJS(v, &out); err != nil {
		t.Fatal(err)
	}
	return out
}

func field(t testing.TB, v safejs.Value, name string) safejs.Value {
	t.Helper()
	f, err := v.Get(name)
	if err != nil {
		t.Fatal(err)
	}
	return f
}

func jsInts(v []int) safejs.Value {
	a := make([]any, len(v))
	for i, x := range v {
		a[i] = x
	}
	arr, _ := safejs.ValueOf(a)
	return arr
}

// The frontier search split the way engine.js splits it over workers
// (frontierParts, frontierPart for each part, the candidates joined and
// sorted, frontierCheck over consecutive pieces) finds the same set as
// frontier(study). The study has more units than one part holds (16,384),
// so there are several parts and the last check matters. Source: the
// engine itself (dea.Frontier, checked in engine/dea); this tests the
// bridge's bookkeeping.
func TestSplitFrontierThroughBridge(t *testing.T) {
	st := generatedStudy(t, 20000)
	want := ints(t, field(t, ok(t, "frontier", st), "frontier"))
	info := ok(t, "frontierParts", st)
	parts, _ := field(t, info, "parts").Int()
	units, _ := field(t, info, "units").Int()
	if parts < 2 || units != 20000 {
		t.Fatalf("frontierParts = %s, want at least two parts of 20000 units", stringify(t, info))
	}
	var pool []int
	for p := range parts {
		pool = append(pool, ints(t, field(t, ok(t, "frontierPart", st, p), "candidates"))...)
	}
	slices.Sort(pool)
	var got []int
	const pieces = 3
	for k := range pieces {
		lo, hi := k*len(pool)/pieces, (k+1)*len(pool)/pieces
		got = append(got, ints(t, field(t, ok(t, "frontierCheck", st, jsInts(pool), lo, hi), "kept"))...)
	}
	if !slices.Equal(got, want) {
		t.Errorf("split search: %d candidates, frontier(study): %d", len(got), len(want))
	}
}

// runJSON(study, onProgress, null, frontier, w, k) for w = 0..k-1 (run's
// arguments, the result as JSON bytes), merged, is identical to one whole
// run(study): every number, bit for bit (compared in the engine's own JSON
// form). Source: the engine itself (dea.Run, checked against the GLPK
// oracle in engine/dea).
func TestSharedRunThroughBridge(t *testing.T) {
	st := generatedStudy(t, 1500)
	whole := canonical(t, stringify(t, ok(t, "run", st)))
	front := field(t, ok(t, "frontier", st), "frontier")
	const k = 3
	var parts []*dea.Result
	for w := range k {
		last := 0
		progress, err := safejs.FuncOf(func(_ safejs.Value, args []safejs.Value) any {
			last, _ = args[0].Int()
			return nil
		})
		if err != nil {
			t.Fatal(err)
		}
		res := ok(t, "runJSON", st, progress.Value(), safejs.Null(), front, w, k)
		progress.Release()
		n, err := res.Length()
		if err != nil {
			t.Fatal(err)
		}
		b := make([]byte, n)
		if _, err := safejs.CopyBytesToGo(b, res); err != nil {
			t.Fatalf("runJSON did not answer with bytes: %v", err)
		}
		r, err := api.ReadResult(b)
		if err != nil {
			t.Fatal(err)
		}
		if last != len(r.Units) || len(r.Units) == 0 {
			t.Errorf("share %d: progress ended at %d for %d units", w, last, len(r.Units))
		}
		parts = append(parts, r)
	}
	merged, err := dea.Merge(parts...)
	if err != nil {
		t.Fatal(err)
	}
	mj, err := export.JSON(merged)
	if err != nil {
		t.Fatal(err)
	}
	if got := noNegativeZero(string(mj)); got != whole {
		t.Errorf("%d shares merged differ from the whole run (%d and %d bytes)", k, len(got), len(whole))
	}
}

// Arguments of the split requests that cannot be right get a message.
func TestSplitRequestsRejectBadArguments(t *testing.T) {
	demo := call(t, "demo")
	pool := jsInts([]int{0, 1, 2})
	for _, tc := range []struct {
		name string
		args []any
		want string
	}{
		{"frontierParts", nil, "missing"},
		{"frontierPart", []any{demo}, "the part of the search must be a number"},
		{"frontierPart", []any{demo, "0"}, "must be a number"},
		{"frontierPart", []any{demo, 0.5}, "must be a whole number, not 0.5"},
		{"frontierPart", []any{demo, 3}, "has no part 3"},
		{"frontierCheck", []any{demo}, "pool of candidates is missing"},
		{"frontierCheck", []any{demo, "nonsense", 0, 1}, "pool of candidates could not be read"},
		{"frontierCheck", []any{demo, pool}, "start of the piece to check must be a number"},
		{"frontierCheck", []any{demo, pool, 0}, "end of the piece to check must be a number"},
		{"frontierCheck", []any{demo, pool, 1, 4}, "from 1 to 4"},
		{"frontierCheck", []any{demo, jsInts([]int{2, 0}), 0, 1}, "increasing order"},
		{"frontierCheck", []any{demo, jsInts([]int{0, 999}), 0, 1}, "names unit 999"},
		{"run", []any{demo, safejs.Null(), safejs.Null(), safejs.Null(), 2, 2}, "share 2 of a run shared among 2 workers does not exist"},
		{"run", []any{demo, safejs.Null(), safejs.Null(), safejs.Null(), 0}, "the number of shares of the run must be a number"},
		{"run", []any{demo, safejs.Null(), jsInts([]int{0}), safejs.Null(), 0, 2}, "cannot also have its own list"},
	} {
		v := call(t, tc.name, tc.args...)
		if e := js.ErrorOf(v); e == "" || !strings.Contains(e, tc.want) {
			t.Errorf("%s%v = %s, want an error containing %q", tc.name, tc.args, stringify(t, v), tc.want)
		}
	}
}

// The bridge keeps the last study read for the next request; two studies
// asked for in turn still each get their own results, whether sent as
// objects or as JSON text.
func TestStudiesAskedInTurnKeepTheirResults(t *testing.T) {
	a := generatedStudy(t, 60)
	s, err := api.ReadStudy([]byte(a))
	if err != nil {
		t.Fatal(err)
	}
	s.Values[5][0] /= 4 // unit 6 needs a quarter of the first input: a different study
	var bb bytes.Buffer
	if err := s.Write(&bb); err != nil {
		t.Fatal(err)
	}
	b := bb.String()
	native := func(text string) string {
		st, err := api.ReadStudy([]byte(text))
		if err != nil {
			t.Fatal(err)
		}
		d, _, err := st.Data()
		if err != nil {
			t.Fatal(err)
		}
		r, err := dea.Run(context.Background(), &d, st.Settings, nil)
		if err != nil {
			t.Fatal(err)
		}
		j, _ := export.JSON(r)
		return noNegativeZero(string(j))
	}
	want := map[string]string{a: native(a), b: native(b)}
	if want[a] == want[b] {
		t.Fatal("the two studies have the same results; the test cannot tell them apart")
	}
	j, _ := safejs.Global().Get("JSON")
	// Asked twice in a row, a study is served from the cache the second time.
	for i, q := range []struct {
		text   string
		object bool // as an object, the way the worker receives it
	}{{a, false}, {a, false}, {b, true}, {b, true}, {a, true}, {b, false}, {b, false}, {a, false}} {
		var arg any = q.text
		if q.object {
			arg, _ = j.Call("parse", q.text)
		}
		if got := canonical(t, stringify(t, ok(t, "run", arg))); got != want[q.text] {
			t.Errorf("request %d got results that are not its study's", i)
		}
	}
}
