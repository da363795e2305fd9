package bench

import (
	"fmt"
	"math"
	"math/rand/v2"

	"peerlens/engine/dea"
)

// Config describes a generated study. The zero value of every field but
// Units takes the default given beside it.
type Config struct {
	Units      int     // number of units
	Inputs     int     // 0: 3
	Outputs    int     // 0: 2
	OnFrontier float64 // share of units exactly on the frontier (0: 0.05; negative: none)
	Sigma      float64 // scale of the half-normal inefficiency (0: 0.3)
	Seed       uint64  // the random stream
}

func (c Config) withDefaults() Config {
	if c.Inputs <= 0 {
		c.Inputs = 3
	}
	if c.Outputs <= 0 {
		c.Outputs = 2
	}
	switch {
	case c.OnFrontier == 0:
		c.OnFrontier = 0.05
	case c.OnFrontier < 0:
		c.OnFrontier = 0
	}
	if c.Sigma <= 0 {
		c.Sigma = 0.3
	}
	return c
}

// Generate draws the study described by c (see the package comment).
func Generate(c Config) *dea.Data {
	c = c.withDefaults()
	n, m, s := c.Units, c.Inputs, c.Outputs
	rng := rand.New(rand.NewPCG(c.Seed, 0x5eed))
	d := &dea.Data{
		Units:       make([]string, n),
		InputNames:  make([]string, m),
		OutputNames: make([]string, s),
		X:           make([][]float64, n),
		Y:           make([][]float64, n),
	}
	for i := range d.InputNames {
		d.InputNames[i] = fmt.Sprintf("input %d", i+1)
	}
	for r := range d.OutputNames {
		d.OutputNames[r] = fmt.Sprintf("output %d", r+1)
	}
	// One backing array per matrix keeps large studies compact.
	xs := make([]float64, n*m)
	ys := make([]float64, n*s)
	w := make([]float64, s)
	for j := 0; j < n; j++ {
		x, y := xs[j*m:(j+1)*m:(j+1)*m], ys[j*s:(j+1)*s:(j+1)*s]
		f := 1.0
		for i := range x {
			x[i] = 1 + 99*rng.Float64()
			f *= math.Pow(x[i], 0.8/float64(m))
		}
		eff := 1.0
		if rng.Float64() >= c.OnFrontier {
			eff = math.Exp(-math.Abs(rng.NormFloat64()) * c.Sigma)
		}
		norm := 0.0
		for r := range w {
			w[r] = 0.2 + rng.Float64()
			norm += w[r] * w[r]
		}
		norm = math.Sqrt(norm)
		for r := range y {
			y[r] = f * eff * w[r] / norm
		}
		d.Units[j] = fmt.Sprintf("U%06d", j+1)
		d.X[j], d.Y[j] = x, y
	}
	return d
}
