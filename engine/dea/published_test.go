package dea_test

// Published worked examples (data in testdata/published, sources in its
// README). Every value recalled from memory is marked so and must also agree
// with glpsol --exact in the same test; values we do not hold with
// confidence are taken from glpsol --exact only.

import (
	"context"
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"peerlens/engine/dea"
	"peerlens/engine/internal/oracle"
)

// readPublished reads a testdata/published CSV file (a leading "#" line
// names the source) with the first m numeric columns as inputs.
func readPublished(t *testing.T, name string, m int) *dea.Data {
	t.Helper()
	f, err := os.Open(filepath.Join("..", "..", "testdata", "published", name))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	rows, err := r.ReadAll()
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	d := &dea.Data{InputNames: rows[0][1 : 1+m], OutputNames: rows[0][1+m:]}
	for i, row := range rows[1:] {
		d.Units = append(d.Units, row[0])
		var v []float64
		for k, cell := range row[1:] {
			x, err := strconv.ParseFloat(strings.TrimSpace(cell), 64)
			if err != nil {
				t.Fatalf("%s row %d column %d: %v", name, i+2, k+2, err)
			}
			v = append(v, x)
		}
		d.X = append(d.X, v[:m])
		d.Y = append(d.Y, v[m:])
	}
	return d
}

// exact solves one unit's radial LP with glpsol --exact.
func exact(t *testing.T, d *dea.Data, o int, s oracle.Spec) oracle.Radial {
	t.Helper()
	r, err := oracle.SolveRadial(context.Background(), d.X, d.Y, o, s, oracle.Options{Exact: true, TimeLimit: 60})
	if err != nil {
		t.Fatalf("glpsol --exact, unit %s: %v", d.Units[o], err)
	}
	return r
}

// TestPublishedStoresCCR: Cooper, Seiford & Tone (2007), chapter 1, eight
// stores with one input and one output. Under constant returns a unit's
// score is its sales per employee over the best such ratio (store B, 3/3);
// the scores below are those ratios (from memory), and glpsol --exact must
// agree.
func TestPublishedStoresCCR(t *testing.T) {
	needGlpsol(t)
	d := readPublished(t, "stores.csv", 1)
	want := map[string]float64{ // from memory; exact fractions
		"A": 0.5, "B": 1, "C": 2.0 / 3, "D": 0.75, "E": 0.8, "F": 0.4, "G": 0.5, "H": 0.625,
	}
	for _, o := range []dea.Orientation{dea.Input, dea.Output} {
		res := run(t, d, dea.Model{Returns: dea.Constant, Orientation: o, SecondStage: true})
		for k, u := range res.Units {
			w := want[u.Name]
			if g := exact(t, d, k, oracle.CRS); math.Abs(scoreOf(o == dea.Output, exactOrient(t, d, k, oracle.CRS, o))-w) > 1e-9 || math.Abs(g.Value-w) > 1e-9 {
				t.Errorf("store %s: glpsol --exact disagrees with the published (from memory) %g", u.Name, w)
			}
			if math.Abs(u.Score-w) > 1e-6 {
				t.Errorf("store %s, CCR %s: engine %.12g, published (from memory) %g", u.Name, o, u.Score, w)
			}
		}
	}
}

// exactOrient is exact with the spec oriented like o.
func exactOrient(t *testing.T, d *dea.Data, k int, s oracle.Spec, o dea.Orientation) float64 {
	t.Helper()
	return exact(t, d, k, s.Orient(o == dea.Output)).Value
}

// TestPublishedHospitalsCCR: Cooper, Seiford & Tone (2007), twelve
// hospitals (doctors, nurses -> outpatients, inpatients), CCR input
// orientation; scores as printed to three decimals (from memory), so the
// published comparison is within 5e-4, and the engine must match
// glpsol --exact within 1e-6.
func TestPublishedHospitalsCCR(t *testing.T) {
	needGlpsol(t)
	d := readPublished(t, "hospitals.csv", 2)
	want := map[string]float64{ // from memory, three decimals
		"A": 1, "B": 1, "C": 0.883, "D": 1, "E": 0.763, "F": 0.835,
		"G": 0.902, "H": 0.796, "I": 0.960, "J": 0.871, "K": 0.955, "L": 0.958,
	}
	res := run(t, d, dea.Model{Returns: dea.Constant, Orientation: dea.Input, SecondStage: true})
	for k, u := range res.Units {
		g := exact(t, d, k, oracle.CRS).Value
		if math.Abs(g-want[u.Name]) > 5e-4 {
			t.Errorf("hospital %s: glpsol --exact %.6f, published (from memory) %.3f", u.Name, g, want[u.Name])
		}
		if math.Abs(u.Score-g) > 1e-6 {
			t.Errorf("hospital %s, CCR input: engine %.12g, glpsol --exact %.12g", u.Name, u.Score, g)
		}
	}
}

// TestPublishedDataOtherModels runs the published data sets through the
// other models; the values come from glpsol --exact only (data source
// named in testdata/published/README.md). Super-efficiency is Andersen &
// Petersen (1993); a nil score must match an infeasible LP (Seiford & Zhu
// 1999).
func TestPublishedDataOtherModels(t *testing.T) {
	needGlpsol(t)
	sets := []struct {
		file string
		m    int
	}{{"stores.csv", 1}, {"hospitals.csv", 2}}
	for _, set := range sets {
		d := readPublished(t, set.file, set.m)
		for _, nm := range modelGrid() {
			res := run(t, d, nm.Model)
			for k, u := range res.Units {
				out := nm.Model.Orientation == dea.Output
				g := exact(t, d, k, nm.Spec)
				if !close6(u.Score, scoreOf(out, g.Value)) {
					t.Errorf("%s unit %s, %s: engine score %.12g, glpsol --exact %.12g", set.file, u.Name, nm.Name, u.Score, scoreOf(out, g.Value))
				}
				sp := exact(t, d, k, nm.Spec.Super())
				switch {
				case !sp.Feasible && u.Super != nil:
					t.Errorf("%s unit %s, %s: engine super-efficiency %.12g, glpsol --exact: infeasible", set.file, u.Name, nm.Name, *u.Super)
				case sp.Feasible && u.Super == nil:
					t.Errorf("%s unit %s, %s: engine super-efficiency nil (%s), glpsol --exact %.12g", set.file, u.Name, nm.Name, u.SuperNote, scoreOf(out, sp.Value))
				case sp.Feasible && !close6(*u.Super, scoreOf(out, sp.Value)):
					t.Errorf("%s unit %s, %s: engine super-efficiency %.12g, glpsol --exact %.12g", set.file, u.Name, nm.Name, *u.Super, scoreOf(out, sp.Value))
				}
			}
		}
	}
}
