package dea

import (
	"bytes"
	"encoding/json"
	"math"
	"math/rand/v2"
	"testing"
)

var nastyNames = []string{"North", `<img src=x onerror=alert(1)>`, "quote \" and \\ slash", "tab\tand\nnewline\x01", "bad \xff utf8", "line\u2028sep", "Zürich – ✓", ""}

func randomUnit(rng *rand.Rand, nan bool) UnitResult {
	f := func() float64 {
		switch rng.IntN(8) {
		case 0:
			return 0
		case 1:
			return 1e-9 * rng.Float64()
		case 2:
			return 1e22 * rng.Float64()
		case 3:
			return -rng.Float64()
		}
		return rng.Float64() * 1000
	}
	name := func() string { return nastyNames[rng.IntN(len(nastyNames))] }
	u := UnitResult{Index: rng.IntN(100), Name: name(), Score: f(), Expansion: f(), Status: Inefficient, PeerCount: rng.IntN(5), Free: f(), Problem: name(),
		ScoreCRS: f(), ScoreVRS: f(), ScoreNIRS: f(), ScaleEff: f(), ScaleClass: ScaleIncreasing, SuperNote: name(),
		Cert: Certificate{Verified: rng.IntN(2) == 0, PrimalError: f(), DualError: f(), Gap: f(), Tolerance: 1e-7, Checked: 3}}
	for k := rng.IntN(3); k > 0; k-- {
		u.Peers = append(u.Peers, Peer{Index: k, Name: name(), Lambda: f()})
	}
	for k := rng.IntN(3); k > 0; k-- {
		u.Inputs = append(u.Inputs, Target{Measure: name(), Value: f(), Radial: f(), Slack: f(), Target: f(), Change: f()})
		u.InputW = append(u.InputW, Weight{Measure: name(), Weight: f(), Share: f()})
	}
	if rng.IntN(2) == 0 {
		s := f()
		u.Super = &s
		c := u.Cert
		u.SuperCert = &c
	}
	if nan {
		u.Score = math.NaN()
		if len(u.Inputs) > 0 {
			u.Inputs[0].Change = math.Inf(1)
		}
		u.Cert.Gap = math.NaN()
	}
	return u
}

// Without NaN, the hand-written JSON is byte for byte what encoding/json
// writes for the same tags (plus "verified").
func TestJSONMatchesEncodingJSON(t *testing.T) {
	type plainCert Certificate
	type plainTarget Target
	type plainUnit UnitResult
	rng := rand.New(rand.NewPCG(5, 6))
	for k := 0; k < 500; k++ {
		u := randomUnit(rng, false)
		for _, tg := range u.Inputs {
			want, _ := json.Marshal(plainTarget(tg))
			if got := tg.appendJSON(nil); !bytes.Equal(got, want) {
				t.Fatalf("target:\n got %s\nwant %s", got, want)
			}
		}
		want, _ := json.Marshal(plainCert(u.Cert))
		if got := u.Cert.appendJSON(nil); !bytes.Equal(got, want) {
			t.Fatalf("certificate:\n got %s\nwant %s", got, want)
		}
		// Nested targets and certificates use their own (checked) encoders.
		want, err := json.Marshal(struct {
			plainUnit
			Verified bool `json:"verified"`
		}{plainUnit(u), u.Cert.Verified})
		if err != nil {
			t.Fatal(err)
		}
		if got := u.appendJSON(nil); !bytes.Equal(got, want) {
			t.Fatalf("unit:\n got %s\nwant %s", got, want)
		}
	}
	res := &Result{Model: DefaultModel(), Units: []UnitResult{randomUnit(rng, false)}, Frontier: []int{0, 4}}
	got, _ := json.Marshal(res)
	type plainResult Result
	want, _ := json.Marshal(plainResult(*res))
	if !bytes.Equal(got, want) {
		t.Fatalf("result:\n got %s\nwant %s", got, want)
	}
}

// NaN and infinities, which JSON cannot hold, become null and the output
// stays valid JSON.
func TestJSONNullForNaN(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 9))
	for k := 0; k < 100; k++ {
		u := randomUnit(rng, true)
		b, err := json.Marshal(&Result{Units: []UnitResult{u}})
		if err != nil || !json.Valid(b) {
			t.Fatalf("invalid JSON %s: %v", b, err)
		}
		var back struct {
			Units []map[string]any `json:"units"`
		}
		if err := json.Unmarshal(b, &back); err != nil {
			t.Fatal(err)
		}
		if back.Units[0]["score"] != nil {
			t.Errorf("score of NaN written as %v", back.Units[0]["score"])
		}
		if back.Units[0]["certificate"].(map[string]any)["gap"] != nil {
			t.Errorf("NaN gap not null")
		}
	}
}

func BenchmarkResultJSON(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 1))
	res := &Result{Model: DefaultModel()}
	for k := 0; k < 10000; k++ {
		res.Units = append(res.Units, randomUnit(rng, false))
	}
	b.ResetTimer()
	for k := 0; k < b.N; k++ {
		res.AppendJSON(nil)
	}
}
