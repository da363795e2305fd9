package study

import (
	"math"
	"math/rand/v2"
)

// demoSeed is the seed that generateDemo was run with once to make the
// numbers written out in Demo() and testdata/demo.csv.
const demoSeed = 1

// generateDemo is how the demo's numbers were made (invented data, no real
// pharmacies). Each of the 30 pharmacies gets a size z in [0,1]; its three
// inputs follow the size on a log scale with their own noise:
//
//	staff (FTE)            4 .. 25
//	operating budget (k)   300 .. 2500
//	floor area (m²)        60 .. 400
//
// A true frontier with decreasing returns to scale,
//
//	F = 2.2 * staff^0.40 * budget^0.30 * area^0.15,
//
// is shared between the two outputs by a mix angle a in [0.55, 1.05]
// (a quarter circle, so every mix is efficient): prescriptions dispensed
// (thousands) = F*cos(a) and patient consultations = 40*F*sin(a).
// Five chosen pharmacies (the smallest, the largest and three drawn at
// random) lie on the true frontier (u = 1); the others produce u*F with
// u = exp(-|N(0, 0.35)|), capped at 0.85 so that none sits on the true
// frontier by accident. Values are rounded to what a spreadsheet would hold:
// staff to 0.1 FTE, budget and area to whole numbers, prescriptions to 0.1
// thousand, consultations to whole numbers.
//
// Seeds 1 to 40 were tried and seed 1 kept: the variable-returns frontier
// of its sample (checked by glpsol in TestDemoFrontier) holds the five
// chosen pharmacies and one more, Old Dairy Yard (u = 0.85), which the
// sample frontier, lying below the true one as it always does, reaches.
func generateDemo(seed uint64) [][]float64 {
	const n = 30
	rng := rand.New(rand.NewPCG(seed, 0x9e3779b97f4a7c15))
	normal := func() float64 { // Box-Muller, so the stream is fixed by PCG alone
		u1, u2 := rng.Float64(), rng.Float64()
		return math.Sqrt(-2*math.Log(1-u1)) * math.Cos(2*math.Pi*u2)
	}
	clamp := func(v float64) float64 { return math.Min(1, math.Max(0, v)) }
	logScale := func(lo, hi, z float64) float64 { return lo * math.Exp(math.Log(hi/lo)*z) }
	round := func(v float64, decimals int) float64 { // v to the nearest 10^-decimals, as typed
		p := math.Pow(10, float64(decimals))
		return math.Round(v*p) / p
	}

	z := make([]float64, n)
	for i := range z {
		z[i] = rng.Float64()
	}
	small, large := 0, 0
	for i := range z {
		if z[i] < z[small] {
			small = i
		}
		if z[i] > z[large] {
			large = i
		}
	}
	onFrontier := map[int]bool{small: true, large: true}
	for len(onFrontier) < 5 {
		onFrontier[rng.IntN(n)] = true
	}
	rows := make([][]float64, n)
	for i := range rows {
		staff := round(logScale(4, 25, clamp(z[i]+0.03*normal())), 1)
		budget := round(logScale(300, 2500, clamp(z[i]+0.03*normal())), 0)
		area := round(logScale(60, 400, clamp(z[i]+0.05*normal())), 0)
		f := 2.2 * math.Pow(staff, 0.40) * math.Pow(budget, 0.30) * math.Pow(area, 0.15)
		a := 0.55 + 0.5*rng.Float64()
		u := math.Min(0.85, math.Exp(-math.Abs(0.35*normal())))
		if onFrontier[i] {
			u = 1
		}
		rx := round(u*f*math.Cos(a), 1)
		cons := round(40*u*f*math.Sin(a), 0)
		rows[i] = []float64{staff, budget, area, rx, cons}
	}
	return rows
}
