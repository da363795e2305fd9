package main

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"slices"
	"strings"
	"text/tabwriter"
)

// printTable reads the JSON lines of the engine (native and wasm) and of the
// baseline and prints one column per study size.
func printTable(w io.Writer, files []string) error {
	engine := map[string]map[int]Measure{}
	base := map[int]Baseline{}
	var sizes []int
	addSize := func(n int) {
		if !slices.Contains(sizes, n) {
			sizes = append(sizes, n)
		}
	}
	for _, name := range files {
		f, err := os.Open(name)
		if err != nil {
			return err
		}
		sc := bufio.NewScanner(f)
		sc.Buffer(make([]byte, 1<<20), 1<<20)
		for sc.Scan() {
			line := strings.TrimSpace(sc.Text())
			if !strings.HasPrefix(line, "{") {
				continue
			}
			var probe struct {
				Runtime string `json:"runtime"`
			}
			if err := json.Unmarshal([]byte(line), &probe); err != nil {
				f.Close()
				return fmt.Errorf("%s: %v", name, err)
			}
			if probe.Runtime == "highs" {
				var b Baseline
				if err := json.Unmarshal([]byte(line), &b); err != nil {
					f.Close()
					return err
				}
				base[b.Units] = b
				addSize(b.Units)
				continue
			}
			var m Measure
			if err := json.Unmarshal([]byte(line), &m); err != nil {
				f.Close()
				return err
			}
			if engine[m.Runtime] == nil {
				engine[m.Runtime] = map[int]Measure{}
			}
			engine[m.Runtime][m.Units] = m
			addSize(m.Units)
		}
		f.Close()
		if err := sc.Err(); err != nil {
			return err
		}
	}
	slices.Sort(sizes)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	row := func(label string, cell func(n int) string) {
		fmt.Fprintf(tw, "%s\t", label)
		for _, n := range sizes {
			fmt.Fprintf(tw, "%s\t", cell(n))
		}
		fmt.Fprintln(tw)
	}
	nat, wasm := engine["native"], engine["wasm"]
	get := func(mm map[int]Measure, n int) (Measure, bool) {
		m, ok := mm[n]
		return m, ok
	}
	num := func(v float64, ok bool, format string) string {
		if !ok {
			return "-"
		}
		return fmt.Sprintf(format, v)
	}
	row("units", func(n int) string { return fmt.Sprint(n) })
	row("candidate units", func(n int) string { m, ok := get(nat, n); return num(float64(m.Frontier), ok, "%.0f") })
	row("units with score 1", func(n int) string { m, ok := get(nat, n); return num(float64(m.Efficient), ok, "%.0f") })
	row("certificates verified", func(n int) string {
		m, ok := get(nat, n)
		if !ok {
			return "-"
		}
		return fmt.Sprintf("%d/%d", m.Verified, m.Units)
	})
	row("engine native, s", func(n int) string { m, ok := get(nat, n); return num(m.EngineSec, ok, "%.3f") })
	row("candidate set alone (own call), s", func(n int) string { m, ok := get(nat, n); return num(m.FrontierSec, ok, "%.3f") })
	row("engine wasm (Node), s", func(n int) string { m, ok := get(wasm, n); return num(m.EngineSec, ok, "%.3f") })
	row("floor native, s", func(n int) string { m, ok := get(nat, n); return num(m.FloorSec, ok, "%.4f") })
	row("floor wasm, s", func(n int) string { m, ok := get(wasm, n); return num(m.FloorSec, ok, "%.4f") })
	row("HiGHS per unit, s", func(n int) string { b, ok := base[n]; return num(b.PerUnitSec, ok, "%.4f") })
	row("HiGHS units solved", func(n int) string {
		b, ok := base[n]
		if !ok {
			return "-"
		}
		if b.Sampled < b.Units {
			return fmt.Sprintf("%d (sample)", b.Sampled)
		}
		return fmt.Sprint(b.Sampled)
	})
	row("HiGHS all units, s", func(n int) string {
		b, ok := base[n]
		if !ok {
			return "-"
		}
		if b.Sampled < b.Units {
			return fmt.Sprintf("%.1f (scaled)", b.TotalSec)
		}
		return fmt.Sprintf("%.1f", b.TotalSec)
	})
	row("HiGHS max |score diff|", func(n int) string { b, ok := base[n]; return num(b.MaxAbsDiff, ok && b.Compared > 0, "%.1e") })
	ratio := func(a, b float64, okA, okB bool) string {
		if !okA || !okB || b <= 0 {
			return "-"
		}
		return fmt.Sprintf("%.1fx", a/b)
	}
	row("baseline / engine native", func(n int) string {
		b, okB := base[n]
		m, ok := get(nat, n)
		return ratio(b.TotalSec, m.EngineSec, okB, ok)
	})
	row("engine / floor, native", func(n int) string { m, ok := get(nat, n); return ratio(m.EngineSec, m.FloorSec, ok, ok) })
	row("engine / floor, wasm", func(n int) string { m, ok := get(wasm, n); return ratio(m.EngineSec, m.FloorSec, ok, ok) })
	row("wasm / native", func(n int) string {
		a, okA := get(wasm, n)
		b, okB := get(nat, n)
		return ratio(a.EngineSec, b.EngineSec, okA, okB)
	})
	row("CPU: engine native, s", func(n int) string { m, ok := get(nat, n); return num(m.EngineCPU, ok, "%.3f") })
	row("CPU: engine wasm, s", func(n int) string { m, ok := get(wasm, n); return num(m.EngineCPU, ok, "%.3f") })
	row("CPU: HiGHS all units, s", func(n int) string { b, ok := base[n]; return num(b.PerUnitCPU*float64(b.Units), ok, "%.1f") })
	row("CPU: baseline / engine native", func(n int) string {
		b, okB := base[n]
		m, ok := get(nat, n)
		return ratio(b.PerUnitCPU*float64(b.Units), m.EngineCPU, okB, ok)
	})
	row("CPU: engine / floor, native", func(n int) string { m, ok := get(nat, n); return ratio(m.EngineCPU, m.FloorCPU, ok, ok) })
	row("CPU: engine / floor, wasm", func(n int) string { m, ok := get(wasm, n); return ratio(m.EngineCPU, m.FloorCPU, ok, ok) })
	row("CPU: wasm / native", func(n int) string {
		a, okA := get(wasm, n)
		b, okB := get(nat, n)
		return ratio(a.EngineCPU, b.EngineCPU, okA, okB)
	})
	row("native peak RSS, MB", func(n int) string { m, ok := get(nat, n); return num(m.MaxRSSMB, ok, "%.0f") })
	row("native Go memory, MB", func(n int) string { m, ok := get(nat, n); return num(m.GoSysMB, ok, "%.0f") })
	row("wasm peak RSS (Node), MB", func(n int) string { m, ok := get(wasm, n); return num(m.MaxRSSMB, ok, "%.0f") })
	row("wasm Go memory, MB", func(n int) string { m, ok := get(wasm, n); return num(m.GoSysMB, ok, "%.0f") })
	if err := tw.Flush(); err != nil {
		return err
	}
	for _, n := range sizes {
		if b, ok := base[n]; ok && b.Description != "" {
			fmt.Fprintf(w, "HiGHS at %d units: %s\n", n, b.Description)
		}
	}
	return nil
}
