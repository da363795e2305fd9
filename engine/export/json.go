package export

import (
	"encoding"
	"encoding/json"
	"fmt"
	"math"
	"reflect"
	"slices"
	"strconv"
	"strings"
	"sync"
	"unicode/utf8"
)

// JSON encodes v like encoding/json (field names and omitempty from json
// tags, json.Marshaler honoured), except that NaN and infinities are written
// as null instead of failing. DEA results use NaN for numbers that are not
// defined (a percentage change from zero, a score that was not computed);
// encoding/json refuses them.
//
// Supported: bools, numbers, strings, structs (exported fields; embedded
// structs without a tag are flattened), pointers, interfaces, slices,
// arrays and maps with string keys (written in key order).
func JSON(v any) ([]byte, error) {
	e := encoder{b: make([]byte, 0, 1024)}
	if err := e.value(reflect.ValueOf(v)); err != nil {
		return nil, err
	}
	return e.b, nil
}

// jsonAppender is a json.Marshaler that can also append its JSON form to a
// buffer (dea.Result does); its output must equal MarshalJSON's.
type jsonAppender interface {
	AppendJSON(b []byte) []byte
}

type encoder struct {
	b     []byte
	depth int
}

var (
	marshalerType = reflect.TypeFor[json.Marshaler]()
	textType      = reflect.TypeFor[encoding.TextMarshaler]()
)

func (e *encoder) value(v reflect.Value) error {
	if !v.IsValid() {
		e.b = append(e.b, "null"...)
		return nil
	}
	if e.depth++; e.depth > 1000 {
		return fmt.Errorf("export: JSON nesting deeper than 1000 (a cycle?)")
	}
	defer func() { e.depth-- }()
	if v.Kind() != reflect.Pointer && v.CanAddr() && v.Addr().Type().Implements(marshalerType) {
		v = v.Addr()
	}
	if v.Type().Implements(marshalerType) {
		if v.Kind() == reflect.Pointer && v.IsNil() {
			e.b = append(e.b, "null"...)
			return nil
		}
		if a, ok := v.Interface().(jsonAppender); ok {
			e.b = a.AppendJSON(e.b) // large results: written in place, not copied
			return nil
		}
		raw, err := v.Interface().(json.Marshaler).MarshalJSON()
		if err != nil {
			return err
		}
		e.b = append(e.b, raw...)
		return nil
	}
	switch v.Kind() {
	case reflect.Bool:
		e.b = strconv.AppendBool(e.b, v.Bool())
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		e.b = strconv.AppendInt(e.b, v.Int(), 10)
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64, reflect.Uintptr:
		e.b = strconv.AppendUint(e.b, v.Uint(), 10)
	case reflect.Float32, reflect.Float64:
		e.float(v.Float())
	case reflect.String:
		e.string(v.String())
	case reflect.Pointer, reflect.Interface:
		if v.IsNil() {
			e.b = append(e.b, "null"...)
			return nil
		}
		return e.value(v.Elem())
	case reflect.Slice:
		if v.IsNil() {
			e.b = append(e.b, "null"...)
			return nil
		}
		return e.array(v)
	case reflect.Array:
		return e.array(v)
	case reflect.Map:
		return e.object(v)
	case reflect.Struct:
		return e.structure(v)
	default:
		return fmt.Errorf("export: cannot write a %s as JSON", v.Type())
	}
	return nil
}

func (e *encoder) float(f float64) {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		e.b = append(e.b, "null"...)
		return
	}
	// As encoding/json (and JavaScript) write numbers: plain decimals, with
	// an exponent only for very small or very large magnitudes.
	a, format := math.Abs(f), byte('f')
	if a != 0 && (a < 1e-6 || a >= 1e21) {
		format = 'e'
	}
	start := len(e.b)
	e.b = strconv.AppendFloat(e.b, f, format, -1, 64)
	if format == 'e' { // 1e-07 -> 1e-7
		if n := len(e.b); n-start >= 4 && e.b[n-4] == 'e' && e.b[n-3] == '-' && e.b[n-2] == '0' {
			e.b[n-2] = e.b[n-1]
			e.b = e.b[:n-1]
		}
	}
}

func (e *encoder) array(v reflect.Value) error {
	e.b = append(e.b, '[')
	for i := range v.Len() {
		if i > 0 {
			e.b = append(e.b, ',')
		}
		if err := e.value(v.Index(i)); err != nil {
			return err
		}
	}
	e.b = append(e.b, ']')
	return nil
}

func (e *encoder) object(v reflect.Value) error {
	if v.IsNil() {
		e.b = append(e.b, "null"...)
		return nil
	}
	kt := v.Type().Key()
	if kt.Kind() != reflect.String && !kt.Implements(textType) {
		return fmt.Errorf("export: cannot write a map with %s keys as JSON", kt)
	}
	keys := make([]string, 0, v.Len())
	vals := make(map[string]reflect.Value, v.Len())
	for it := v.MapRange(); it.Next(); {
		k := it.Key()
		var name string
		if kt.Kind() == reflect.String {
			name = k.String()
		} else {
			t, err := k.Interface().(encoding.TextMarshaler).MarshalText()
			if err != nil {
				return err
			}
			name = string(t)
		}
		keys = append(keys, name)
		vals[name] = it.Value()
	}
	slices.Sort(keys)
	e.b = append(e.b, '{')
	for i, k := range keys {
		if i > 0 {
			e.b = append(e.b, ',')
		}
		e.string(k)
		e.b = append(e.b, ':')
		if err := e.value(vals[k]); err != nil {
			return err
		}
	}
	e.b = append(e.b, '}')
	return nil
}

// field is one struct field as written.
type field struct {
	name      string
	index     []int
	omitEmpty bool
}

// fields lists the written fields of a struct type, flattening embedded
// structs that have no tag. A field closer to the top hides a deeper field
// of the same name, as in encoding/json.
func fields(t reflect.Type) []field {
	if f, ok := fieldCache.Load(t); ok {
		return f.([]field)
	}
	f := listFields(t)
	fieldCache.Store(t, f)
	return f
}

var fieldCache sync.Map // reflect.Type -> []field

func listFields(t reflect.Type) []field {
	var out []field
	seen := make(map[string]bool)
	var walk func(t reflect.Type, index []int, depth int)
	walk = func(t reflect.Type, index []int, depth int) {
		var deeper []reflect.StructField
		for i := range t.NumField() {
			sf := t.Field(i)
			tag := sf.Tag.Get("json")
			if tag == "-" {
				continue
			}
			name, opts, _ := strings.Cut(tag, ",")
			if sf.Anonymous && name == "" {
				ft := sf.Type
				if ft.Kind() == reflect.Pointer {
					ft = ft.Elem()
				}
				if ft.Kind() == reflect.Struct {
					deeper = append(deeper, sf)
					continue
				}
			}
			if !sf.IsExported() {
				continue
			}
			if name == "" {
				name = sf.Name
			}
			if seen[name] {
				continue
			}
			seen[name] = true
			out = append(out, field{name: name, index: append(slices.Clone(index), i), omitEmpty: strings.Contains(","+opts+",", ",omitempty,")})
		}
		for _, sf := range deeper {
			ft := sf.Type
			if ft.Kind() == reflect.Pointer {
				ft = ft.Elem()
			}
			walk(ft, append(slices.Clone(index), sf.Index...), depth+1)
		}
	}
	walk(t, nil, 0)
	// Fields in the order of their position in the struct, embedded
	// fields where their struct is embedded, as encoding/json writes them.
	slices.SortFunc(out, func(a, b field) int { return slices.Compare(a.index, b.index) })
	return out
}

func (e *encoder) structure(v reflect.Value) error {
	e.b = append(e.b, '{')
	first := true
	for _, f := range fields(v.Type()) {
		fv, err := v.FieldByIndexErr(f.index)
		if err != nil { // nil embedded pointer
			continue
		}
		if f.omitEmpty && isEmpty(fv) {
			continue
		}
		if !first {
			e.b = append(e.b, ',')
		}
		first = false
		e.string(f.name)
		e.b = append(e.b, ':')
		if err := e.value(fv); err != nil {
			return err
		}
	}
	e.b = append(e.b, '}')
	return nil
}

// isEmpty is encoding/json's omitempty test.
func isEmpty(v reflect.Value) bool {
	switch v.Kind() {
	case reflect.Array, reflect.Map, reflect.Slice, reflect.String:
		return v.Len() == 0
	case reflect.Bool, reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64,
		reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64, reflect.Uintptr,
		reflect.Float32, reflect.Float64, reflect.Interface, reflect.Pointer:
		return v.IsZero()
	}
	return false
}

const hex = "0123456789abcdef"

// string writes s as a JSON string, escaping what JSON and JavaScript
// require and replacing invalid UTF-8 with U+FFFD.
func (e *encoder) string(s string) {
	e.b = append(e.b, '"')
	for i := 0; i < len(s); {
		c := s[i]
		if c < utf8.RuneSelf {
			switch {
			case c == '"' || c == '\\':
				e.b = append(e.b, '\\', c)
			case c == '\n':
				e.b = append(e.b, '\\', 'n')
			case c == '\r':
				e.b = append(e.b, '\\', 'r')
			case c == '\t':
				e.b = append(e.b, '\\', 't')
			case c < 0x20:
				e.b = append(e.b, '\\', 'u', '0', '0', hex[c>>4], hex[c&0xf])
			default:
				e.b = append(e.b, c)
			}
			i++
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			e.b = append(e.b, `\ufffd`...)
		case r == '\u2028' || r == '\u2029':
			e.b = append(e.b, '\\', 'u', '2', '0', '2', hex[r&0xf])
		default:
			e.b = append(e.b, s[i:i+size]...)
		}
		i += size
	}
	e.b = append(e.b, '"')
}
