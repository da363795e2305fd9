package study

import "peerlens/engine/dea"

// demoMeasures are the demo's measures: three inputs, then two outputs.
var demoMeasures = []struct {
	name string
	role Role
}{
	{"Staff (FTE)", Input},
	{"Operating budget (thousands)", Input},
	{"Floor area (m²)", Input},
	{"Prescriptions dispensed (thousands)", Output},
	{"Patient consultations", Output},
}

// Demo returns the demo study: 30 community pharmacies of an invented
// district, with three inputs (staff in full-time equivalents, operating
// budget in thousands, floor area in square metres) and two outputs
// (prescriptions dispensed in thousands a year, patient consultations a
// year). The data is invented: the names are made-up street-style labels,
// and the numbers were generated once, from a known frontier plus
// inefficiency, by generateDemo in demogen_test.go (seed 1), so that six
// pharmacies lie on the variable-returns frontier. testdata/demo.csv holds
// the same table. Each call returns a fresh copy.
func Demo() *Study {
	rows := []struct {
		name                        string
		staff, budget, area, rx, cs float64
	}{
		{"Market Square", 4.8, 358, 69, 17, 642},
		{"Station Road", 9.8, 678, 136, 33.2, 1012},
		{"Harbour Front", 4.5, 349, 72, 12.7, 649},
		{"Mill Lane", 14.5, 1482, 247, 79.3, 2799},
		{"High Street North", 7, 548, 96, 40, 1171},
		{"High Street South", 10.5, 995, 151, 53.9, 2400},
		{"Orchard Walk", 16, 1676, 205, 77.6, 2505},
		{"Toll Bridge Road", 19.9, 1852, 312, 118.3, 2989},
		{"Canal Side", 18.5, 1860, 283, 65.6, 3186},
		{"Quarry Hill", 12.8, 1016, 243, 70.2, 2519},
		{"Chapel Row", 6.3, 538, 99, 28.5, 1191},
		{"Meadow View", 24.4, 2256, 342, 135.4, 5449},
		{"Riverside Walk", 11.5, 1128, 169, 47.9, 2225},
		{"Castle Parade", 10.1, 985, 172, 55.9, 2243},
		{"Fountain Court", 6.5, 528, 107, 35, 1496},
		{"Railway Arches", 9, 767, 144, 34.1, 1969},
		{"Old Dairy Yard", 4.8, 366, 66, 32.5, 833},
		{"Windmill Rise", 20.7, 2052, 307, 144.4, 3741},
		{"Ferry Landing", 8.9, 589, 121, 24.7, 1129},
		{"Lantern Close", 5.3, 422, 85, 22.4, 1179},
		{"Copper Beech Road", 10.3, 1054, 184, 53.7, 1545},
		{"Tannery Lane", 4.4, 309, 71, 28.6, 1237},
		{"Sheep Market", 6.6, 581, 114, 39.8, 983},
		{"Willow Crescent", 15.7, 1416, 231, 58.5, 3830},
		{"Foundry Street", 20.6, 1712, 334, 106.5, 3633},
		{"Signal Box Lane", 23.2, 2295, 373, 58, 3924},
		{"Clocktower Place", 19.6, 1780, 298, 101.3, 4982},
		{"Heathland Corner", 8.7, 800, 144, 29, 1438},
		{"Ropewalk", 8, 679, 113, 37.2, 2495},
		{"Lamplighter Way", 8.6, 746, 146, 52.5, 1724},
	}
	s := &Study{
		Format:   FormatVersion,
		Title:    "Community pharmacies of an invented district (demo)",
		Settings: dea.DefaultModel(),
		Notes: "Invented data for trying Peerlens: 30 community pharmacies in an invented district. " +
			"The names are made up and the numbers were generated from a known frontier plus inefficiency; " +
			"no real pharmacy or place is described.",
	}
	for _, m := range demoMeasures {
		s.Measures = append(s.Measures, NewMeasure(m.name, m.role))
	}
	for _, r := range rows {
		s.Units = append(s.Units, r.name)
		s.Values = append(s.Values, []float64{r.staff, r.budget, r.area, r.rx, r.cs})
	}
	return s
}
