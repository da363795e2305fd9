package dea

import (
	"encoding/json"
	"math"
)

// number turns NaN and infinities, which JSON cannot hold, into null.
func number(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

// MarshalJSON writes a missing percentage change (today's value is 0) as null.
func (t Target) MarshalJSON() ([]byte, error) {
	type plain Target
	return json.Marshal(struct {
		plain
		Change *float64 `json:"changePercent"`
	}{plain(t), number(t.Change)})
}

// MarshalJSON writes the score of a unit that could not be solved as null
// and adds the certificate's verdict as "verified".
func (u UnitResult) MarshalJSON() ([]byte, error) {
	type plain UnitResult
	return json.Marshal(struct {
		plain
		Score    *float64 `json:"score"`
		Verified bool     `json:"verified"`
	}{plain(u), number(u.Score), u.Cert.Verified})
}
