package dea

import (
	"context"
	"math"
	"testing"
)

// cellValues are the values fuzzed tables are made of: zeros, ties, and
// magnitudes from 1e-6 to 1e8.
var cellValues = []float64{0, 1, 1, 2, 3, 5, 7, 10, 0.5, 1e-4, 1e-6, 1e7, 1e8, 0, 1e-3, 3e4, 123.456, 2, 2, 3}

// FuzzRun builds small tables from the fuzzer's bytes and runs every model on
// them. Whatever the data, the engine must return (no panic, no endless
// loop), and every verified result must make sense: radial scores in (0, 1],
// a verified super-efficiency score is positive and finite.
func FuzzRun(f *testing.F) {
	f.Add([]byte{3, 1, 1, 0, 1, 2, 3, 4, 5, 6, 7, 8, 9})
	f.Add([]byte{5, 2, 2, 0, 0, 0, 0, 1, 1, 1, 1, 2, 2, 2, 2, 3, 3, 3, 3, 4, 4, 4, 4})
	f.Add([]byte{4, 1, 2, 13, 14, 11, 12, 13, 14, 11, 12, 15, 15, 15, 15})
	f.Add([]byte{6, 3, 1, 6, 7, 8, 6, 7, 8, 9, 9, 9, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15})
	f.Fuzz(func(t *testing.T, b []byte) {
		if len(b) < 4 {
			return
		}
		n, m, s := 1+int(b[0])%8, 1+int(b[1])%3, 1+int(b[2])%3
		model := int(b[3])
		b = b[4:]
		next := func(k int) float64 {
			if len(b) == 0 {
				return cellValues[k%len(cellValues)]
			}
			v := cellValues[int(b[0])%len(cellValues)]
			b = b[1:]
			return v
		}
		d := &Data{}
		for j := 0; j < n; j++ {
			x := make([]float64, m)
			y := make([]float64, s)
			for i := range x {
				x[i] = next(j + i)
			}
			for r := range y {
				y[r] = next(j + r + 1)
			}
			d.X, d.Y = append(d.X, x), append(d.Y, y)
		}
		rts := []Returns{Constant, Variable, NonIncreasing, NonDecreasing, Bounded}[model%5]
		or := []Orientation{Input, Output}[(model/5)%2]
		mdl := Model{Returns: rts, Orientation: or, SecondStage: true, Super: true, ScaleDetail: true, Lower: 0.5, Upper: 2}
		res, err := Run(context.Background(), d, mdl, nil)
		if err != nil {
			return // data errors are fine; the point is no panic and no loop
		}
		for _, u := range res.Units {
			if u.Status == NotSolved {
				if u.Problem == "" {
					t.Errorf("unit %d not solved without a reason", u.Index)
				}
				continue
			}
			if u.Cert.Verified && (u.Score <= 0 || u.Score > 1+1e-9 || math.IsNaN(u.Score)) {
				t.Errorf("%v/%v unit %d: verified score %v outside (0, 1]", rts, or, u.Index, u.Score)
			}
			if u.Super != nil && u.SuperCert != nil && u.SuperCert.Verified && (*u.Super <= 0 || math.IsInf(*u.Super, 0) || math.IsNaN(*u.Super)) {
				t.Errorf("%v/%v unit %d: super-efficiency %v", rts, or, u.Index, *u.Super)
			}
			if u.Super == nil && u.SuperNote == "" {
				t.Errorf("%v/%v unit %d: no super-efficiency and no reason", rts, or, u.Index)
			}
		}
	})
}
