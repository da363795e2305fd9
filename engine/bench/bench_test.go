package bench

import (
	"context"
	"fmt"
	"math"
	"testing"

	"peerlens/engine/dea"
)

// model is the setting the speed goals are stated for: variable returns,
// input orientation, with slacks (second stage) and peers.
var model = dea.Model{Returns: dea.Variable, Orientation: dea.Input, SecondStage: true}

func benchmarkRun(b *testing.B, n int) {
	d := Generate(Config{Units: n, Seed: 1})
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		if _, err := dea.RunWith(context.Background(), d, model, dea.Options{Workers: 1}); err != nil {
			b.Fatal(err)
		}
	}
}

func benchmarkFrontier(b *testing.B, n int) {
	d := Generate(Config{Units: n, Seed: 1})
	b.ResetTimer()
	for b.Loop() {
		if _, err := dea.Frontier(context.Background(), d); err != nil {
			b.Fatal(err)
		}
	}
}

func benchmarkFloor(b *testing.B, n int) {
	d := Generate(Config{Units: n, Seed: 1})
	f, err := dea.Frontier(context.Background(), d)
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for b.Loop() {
		Floor(d, f)
	}
}

// The whole run on one goroutine (frontier, every unit, second stage,
// certificates).
func BenchmarkRun1000(b *testing.B)  { benchmarkRun(b, 1000) }
func BenchmarkRun10000(b *testing.B) { benchmarkRun(b, 10000) }

// The candidate set alone.
func BenchmarkFrontier1000(b *testing.B)  { benchmarkFrontier(b, 1000) }
func BenchmarkFrontier10000(b *testing.B) { benchmarkFrontier(b, 10000) }

// The floor over the candidate set.
func BenchmarkFloor1000(b *testing.B)  { benchmarkFloor(b, 1000) }
func BenchmarkFloor10000(b *testing.B) { benchmarkFloor(b, 10000) }

// The generator keeps its promises: the same seed gives the same numbers,
// every value is positive, and the share of units exactly on the frontier
// (their outputs' norm equals f(x) = prod x_i^(0.8/m)) is near OnFrontier.
// Source: the generator's own definition (package comment).
func TestGenerateKeepsItsPromises(t *testing.T) {
	for _, c := range []Config{
		{Units: 4000, Seed: 3},
		{Units: 4000, Inputs: 2, Outputs: 3, OnFrontier: 0.2, Seed: 4},
	} {
		t.Run(fmt.Sprintf("%+v", c), func(t *testing.T) {
			a, b := Generate(c), Generate(c)
			cc := c.withDefaults()
			on := 0
			for j := range a.X {
				if len(a.X[j]) != cc.Inputs || len(a.Y[j]) != cc.Outputs {
					t.Fatalf("unit %d has shape %d x %d", j, len(a.X[j]), len(a.Y[j]))
				}
				f := 1.0
				for i, v := range a.X[j] {
					if v != b.X[j][i] || v < 1 || v > 100 {
						t.Fatalf("unit %d input %d: %v (again %v)", j, i, v, b.X[j][i])
					}
					f *= math.Pow(v, 0.8/float64(cc.Inputs))
				}
				norm := 0.0
				for r, v := range a.Y[j] {
					if v != b.Y[j][r] || !(v > 0) {
						t.Fatalf("unit %d output %d: %v (again %v)", j, r, v, b.Y[j][r])
					}
					norm += v * v
				}
				if ratio := math.Sqrt(norm) / f; ratio > 1+1e-12 {
					t.Fatalf("unit %d lies beyond the frontier (%v)", j, ratio)
				} else if ratio > 1-1e-12 {
					on++
				}
			}
			share := float64(on) / float64(len(a.X))
			if share < cc.OnFrontier*0.8 || share > cc.OnFrontier*1.2 {
				t.Errorf("share on the frontier %.3f, asked %.3f", share, cc.OnFrontier)
			}
		})
	}
}
