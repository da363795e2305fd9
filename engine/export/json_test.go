package export

import (
	"bytes"
	"encoding/json"
	"math"
	"reflect"
	"testing"

	"peerlens/engine/dea"
)

type inner struct {
	A int    `json:"a"`
	B string `json:"b,omitempty"`
}

type outer struct {
	inner
	A       float64          `json:"a"` // hides inner.A
	Skip    int              `json:"-"`
	Plain   string           // no tag
	hidden  int              //nolint:unused
	P       *float64         `json:"p"`
	M       map[string]int   `json:"m"`
	L       []float64        `json:"l"`
	Nil     []int            `json:"nil"`
	Any     any              `json:"any"`
	Omit    []string         `json:"omit,omitempty"`
	Raw     json.RawMessage  `json:"raw"`
	Nested  map[string][]int `json:"nested,omitempty"`
	Unicode string           `json:"u"`
}

// For values without NaN, JSON agrees with encoding/json (common practice:
// the standard library is the reference).
func TestJSONMatchesStandardLibrary(t *testing.T) {
	p := 2.5
	v := outer{inner: inner{A: 7, B: "x"}, A: 1e21, Skip: 3, Plain: "q\"\\\n\t\x01<>&", hidden: 4, P: &p,
		M: map[string]int{"z": 1, "a": 2}, L: []float64{0, -0.5, 1e-7, 123456789}, Any: []any{1.0, "s", true, nil},
		Raw: json.RawMessage(`{"k":[1,2]}`), Unicode: "Zürich \u2028 é"}
	got, err := JSON(v)
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false) // JSON does not escape <, > and & (not needed outside HTML)
	if err := enc.Encode(v); err != nil {
		t.Fatal(err)
	}
	want := bytes.TrimSpace(buf.Bytes())
	if string(got) != string(want) {
		t.Errorf("JSON differs from encoding/json:\n got %s\nwant %s", got, want)
	}
	var g, w any
	if err := json.Unmarshal(got, &g); err != nil {
		t.Fatalf("not valid JSON: %v\n%s", err, got)
	}
	if err := json.Unmarshal(want, &w); err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(g, w) {
		t.Errorf("JSON = %s\nencoding/json = %s", got, want)
	}
}

func TestJSONNonFiniteIsNull(t *testing.T) {
	type target struct {
		Value  float64 `json:"value"`
		Change float64 `json:"changePercent"`
	}
	type unit struct {
		Score     float64   `json:"score"`
		Expansion float64   `json:"expansion,omitempty"`
		Targets   []target  `json:"targets"`
		Extra     []float64 `json:"extra"`
	}
	v := unit{Score: math.NaN(), Targets: []target{{0, math.NaN()}, {2, math.Inf(1)}, {4, -50}}, Extra: []float64{math.Inf(-1), 1}}
	if _, err := json.Marshal(v); err == nil {
		t.Fatal("encoding/json accepted NaN")
	}
	got, err := JSON(v)
	if err != nil {
		t.Fatal(err)
	}
	want := `{"score":null,"targets":[{"value":0,"changePercent":null},{"value":2,"changePercent":null},{"value":4,"changePercent":-50}],"extra":[null,1]}`
	if string(got) != want {
		t.Errorf("JSON = %s\nwant %s", got, want)
	}
}

// A result keeps the engine's own JSON form (dea types may carry
// MarshalJSON methods; they are honoured).
func TestJSONHonoursMarshalers(t *testing.T) {
	r := dea.Result{Units: []dea.UnitResult{{Name: "A", Score: 0.5, Inputs: []dea.Target{{Measure: "x", Value: 0, Change: math.NaN()}}}}}
	got, err := JSON(r)
	if err != nil {
		t.Fatal(err)
	}
	var back map[string]any
	if err := json.Unmarshal(got, &back); err != nil {
		t.Fatalf("%v\n%s", err, got)
	}
	u := back["units"].([]any)[0].(map[string]any)
	if u["score"] != 0.5 || u["inputs"].([]any)[0].(map[string]any)["changePercent"] != nil {
		t.Errorf("JSON(result) = %s", got)
	}
	// Written in place (AppendJSON) or through MarshalJSON, value or
	// pointer, alone or inside another value: the same bytes.
	r.Units = append(r.Units, r.Units[0], r.Units[0])
	r.Frontier = []int{0, 2}
	want, _ := r.MarshalJSON()
	for _, v := range []any{r, &r} {
		if got, err := JSON(v); err != nil || string(got) != string(want) {
			t.Errorf("JSON(%T) = %s, %v; MarshalJSON gives %s", v, got, err, want)
		}
	}
	wrapped, err := JSON(map[string]any{"result": &r})
	if err != nil || string(wrapped) != `{"result":`+string(want)+`}` {
		t.Errorf("JSON(wrapped result) = %s, %v", wrapped, err)
	}
}

func TestJSONInvalidUTF8AndUnsupported(t *testing.T) {
	got, err := JSON("a\xffb")
	if err != nil || string(got) != `"a\ufffdb"` {
		t.Errorf("JSON(invalid UTF-8) = %s, %v", got, err)
	}
	if _, err := JSON(make(chan int)); err == nil {
		t.Error("JSON(chan) succeeded")
	}
	if _, err := JSON(map[int]int{1: 2}); err == nil {
		t.Error("JSON(map[int]int) succeeded")
	}
}

func FuzzJSONString(f *testing.F) {
	for _, s := range []string{"", "plain", "\"quoted\"", "\x00\x1f", "\u2028", "\xff\xfe", "é€𝄞"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		got, err := JSON(s)
		if err != nil {
			t.Fatal(err)
		}
		want, _ := json.Marshal(s)
		var g, w string
		if err := json.Unmarshal(got, &g); err != nil {
			t.Fatalf("JSON(%q) = %s: %v", s, got, err)
		}
		json.Unmarshal(want, &w)
		if g != w {
			t.Errorf("JSON(%q) reads back %q, encoding/json gives %q", s, g, w)
		}
	})
}
