package dea_test

import (
	"context"
	"testing"

	"peerlens/engine/dea"
)

// Every result on the hard generated data carries a verified certificate,
// super-efficiency included (DESIGN.md: every reported score is checked
// independently). The certificate is the engine's own check, so this guards
// both the solver and the check against drifting apart; the glpsol oracle
// tests say whether the verified numbers are right.
func TestEveryGeneratedResultVerified(t *testing.T) {
	for _, k := range genKinds {
		for seed := uint64(1); seed <= 4; seed++ {
			c := generate(k, seed, 0)
			for _, nm := range modelGrid() {
				m := nm.Model
				m.Super = true
				res, err := dea.Run(context.Background(), c.Data, m, nil)
				if err != nil {
					t.Errorf("%s, %s: %v", nm.Name, c, err)
					continue
				}
				for _, u := range res.Units {
					if !u.Cert.Verified {
						t.Errorf("%s, %s, unit %d: score %v not verified: %+v", nm.Name, c, u.Index, u.Score, u.Cert)
					}
					if u.SuperCert != nil && !u.SuperCert.Verified {
						t.Errorf("%s, %s, unit %d: super-efficiency %v not verified: %+v", nm.Name, c, u.Index, u.Super, *u.SuperCert)
					}
				}
			}
		}
	}
}
