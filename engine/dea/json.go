package dea

import (
	"encoding/json"
	"math"
	"strconv"
	"unicode/utf8"
)

// The JSON form of results is written by hand: a study of 100,000 units
// produces a result of several hundred megabytes of JSON on its way to the
// page, and reflection made that the slowest step of a large run. The
// output is the JSON that encoding/json would write for the types' tags,
// except that NaN and infinities, which JSON cannot hold, become null, and
// each unit carries the certificate's verdict as "verified".

// MarshalJSON writes the whole result.
func (r *Result) MarshalJSON() ([]byte, error) { return r.AppendJSON(nil), nil }

// AppendJSON appends the JSON form of r to b.
func (r *Result) AppendJSON(b []byte) []byte {
	b = append(b, `{"model":`...)
	mb, _ := json.Marshal(r.Model)
	b = append(b, mb...)
	b = append(b, `,"units":`...)
	if r.Units == nil {
		b = append(b, "null"...)
	} else {
		b = append(b, '[')
		for k := range r.Units {
			if k > 0 {
				b = append(b, ',')
			}
			at := len(b)
			b = r.Units[k].appendJSON(b)
			if k == 0 && len(r.Units) > 1 {
				// Room for the rest at the first unit's size and a fifth
				// more, so that a large result is not copied over and
				// over as it grows.
				need := (len(b)-at+1)*len(r.Units)*6/5 + 16*len(r.Frontier) + 64
				if cap(b)-len(b) < need {
					b = append(make([]byte, 0, len(b)+need), b...)
				}
			}
		}
		b = append(b, ']')
	}
	b = append(b, `,"frontier":`...)
	if r.Frontier == nil {
		b = append(b, "null"...)
	} else {
		b = append(b, '[')
		for k, j := range r.Frontier {
			if k > 0 {
				b = append(b, ',')
			}
			b = strconv.AppendInt(b, int64(j), 10)
		}
		b = append(b, ']')
	}
	return append(b, '}')
}

// MarshalJSON writes the score of a unit that could not be solved as null
// and adds the certificate's verdict as "verified".
func (u UnitResult) MarshalJSON() ([]byte, error) { return u.appendJSON(nil), nil }

// MarshalJSON writes a missing percentage change (today's value is 0) as null.
func (t Target) MarshalJSON() ([]byte, error) { return t.appendJSON(nil), nil }

// MarshalJSON writes a violation that could not be measured as null.
func (c Certificate) MarshalJSON() ([]byte, error) { return c.appendJSON(nil), nil }

func (u *UnitResult) appendJSON(b []byte) []byte {
	b = append(b, `{"index":`...)
	b = strconv.AppendInt(b, int64(u.Index), 10)
	b = key(b, "name")
	b = appendString(b, u.Name)
	b = key(b, "score")
	b = appendFloat(b, u.Score)
	if u.Expansion != 0 {
		b = key(b, "expansion")
		b = appendFloat(b, u.Expansion)
	}
	b = key(b, "status")
	b = appendString(b, string(u.Status))
	b = key(b, "peers")
	if u.Peers == nil {
		b = append(b, "null"...)
	} else {
		b = append(b, '[')
		for k, p := range u.Peers {
			if k > 0 {
				b = append(b, ',')
			}
			b = append(b, `{"index":`...)
			b = strconv.AppendInt(b, int64(p.Index), 10)
			b = key(b, "name")
			b = appendString(b, p.Name)
			b = key(b, "lambda")
			b = appendFloat(b, p.Lambda)
			b = append(b, '}')
		}
		b = append(b, ']')
	}
	b = key(b, "peerCount")
	b = strconv.AppendInt(b, int64(u.PeerCount), 10)
	b = key(b, "inputs")
	b = appendTargets(b, u.Inputs)
	b = key(b, "outputs")
	b = appendTargets(b, u.Outputs)
	b = key(b, "inputWeights")
	b = appendWeights(b, u.InputW)
	b = key(b, "outputWeights")
	b = appendWeights(b, u.OutputW)
	b = key(b, "free")
	b = appendFloat(b, u.Free)
	b = key(b, "certificate")
	b = u.Cert.appendJSON(b)
	if u.Problem != "" {
		b = key(b, "problem")
		b = appendString(b, u.Problem)
	}
	for _, f := range []struct {
		name string
		v    float64
	}{{"scoreCRS", u.ScoreCRS}, {"scoreVRS", u.ScoreVRS}, {"scoreNIRS", u.ScoreNIRS}, {"scaleEfficiency", u.ScaleEff}} {
		if f.v != 0 {
			b = key(b, f.name)
			b = appendFloat(b, f.v)
		}
	}
	if u.ScaleClass != "" {
		b = key(b, "scaleClass")
		b = appendString(b, string(u.ScaleClass))
	}
	b = key(b, "super")
	if u.Super == nil {
		b = append(b, "null"...)
	} else {
		b = appendFloat(b, *u.Super)
	}
	if u.SuperCert != nil {
		b = key(b, "superCertificate")
		b = u.SuperCert.appendJSON(b)
	}
	if u.SuperNote != "" {
		b = key(b, "superNote")
		b = appendString(b, u.SuperNote)
	}
	b = key(b, "verified")
	b = strconv.AppendBool(b, u.Cert.Verified)
	return append(b, '}')
}

func (t *Target) appendJSON(b []byte) []byte {
	b = append(b, `{"measure":`...)
	b = appendString(b, t.Measure)
	b = key(b, "value")
	b = appendFloat(b, t.Value)
	b = key(b, "radial")
	b = appendFloat(b, t.Radial)
	b = key(b, "slack")
	b = appendFloat(b, t.Slack)
	b = key(b, "target")
	b = appendFloat(b, t.Target)
	b = key(b, "changePercent")
	b = appendFloat(b, t.Change)
	return append(b, '}')
}

func appendTargets(b []byte, ts []Target) []byte {
	if ts == nil {
		return append(b, "null"...)
	}
	b = append(b, '[')
	for k := range ts {
		if k > 0 {
			b = append(b, ',')
		}
		b = ts[k].appendJSON(b)
	}
	return append(b, ']')
}

func appendWeights(b []byte, ws []Weight) []byte {
	if ws == nil {
		return append(b, "null"...)
	}
	b = append(b, '[')
	for k, w := range ws {
		if k > 0 {
			b = append(b, ',')
		}
		b = append(b, `{"measure":`...)
		b = appendString(b, w.Measure)
		b = key(b, "weight")
		b = appendFloat(b, w.Weight)
		b = key(b, "share")
		b = appendFloat(b, w.Share)
		b = append(b, '}')
	}
	return append(b, ']')
}

func (c *Certificate) appendJSON(b []byte) []byte {
	b = append(b, `{"verified":`...)
	b = strconv.AppendBool(b, c.Verified)
	b = key(b, "primalError")
	b = appendFloat(b, c.PrimalError)
	b = key(b, "dualError")
	b = appendFloat(b, c.DualError)
	b = key(b, "gap")
	b = appendFloat(b, c.Gap)
	b = key(b, "tolerance")
	b = appendFloat(b, c.Tolerance)
	b = key(b, "checkedUnits")
	b = strconv.AppendInt(b, int64(c.Checked), 10)
	return append(b, '}')
}

func key(b []byte, name string) []byte {
	b = append(b, ',', '"')
	b = append(b, name...)
	return append(b, '"', ':')
}

// appendFloat writes f as encoding/json does, and NaN or an infinity as null.
func appendFloat(b []byte, f float64) []byte {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return append(b, "null"...)
	}
	format := byte('f')
	if a := math.Abs(f); a != 0 && (a < 1e-6 || a >= 1e21) {
		format = 'e'
	}
	b = strconv.AppendFloat(b, f, format, -1, 64)
	if format == 'e' {
		// e-07 -> e-7, as encoding/json writes it.
		if n := len(b); n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
			b[n-2] = b[n-1]
			b = b[:n-1]
		}
	}
	return b
}

const hexDigits = "0123456789abcdef"

// appendString writes s as a JSON string: quotes, backslashes and control
// characters escaped, <, > and & escaped as encoding/json does, invalid
// UTF-8 replaced by U+FFFD.
func appendString(b []byte, s string) []byte {
	b = append(b, '"')
	for i := 0; i < len(s); {
		c := s[i]
		if c < utf8.RuneSelf {
			switch {
			case c == '"' || c == '\\':
				b = append(b, '\\', c)
			case c == '\n':
				b = append(b, '\\', 'n')
			case c == '\r':
				b = append(b, '\\', 'r')
			case c == '\t':
				b = append(b, '\\', 't')
			case c < 0x20 || c == '<' || c == '>' || c == '&':
				b = append(b, '\\', 'u', '0', '0', hexDigits[c>>4], hexDigits[c&0xf])
			default:
				b = append(b, c)
			}
			i++
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			b = append(b, `\ufffd`...)
		case r == '\u2028' || r == '\u2029':
			b = append(b, '\\', 'u', '2', '0', '2', hexDigits[r&0xf])
		default:
			b = append(b, s[i:i+size]...)
		}
		i += size
	}
	return append(b, '"')
}
