package screen

import (
	"context"
	"math"
	"math/rand/v2"
	"reflect"
	"sort"
	"strings"
	"testing"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
	"drawsift/engine/warn"
)

func run(t *testing.T, sc *Scenario) *Result {
	t.Helper()
	res, err := Run(context.Background(), sc, lib(t), nil)
	if err != nil {
		t.Fatal(err)
	}
	return res
}

func byID(res *Result) map[string]*Ranked {
	m := map[string]*Ranked{}
	for i := range res.Ranked {
		m[res.Ranked[i].Solute.ID] = &res.Ranked[i]
	}
	return m
}

// Phillip, Yong & Elimelech (2010) Environ. Sci. Technol. 44:5170: for a
// van 't Hoff draw, Js/Jw = B/(A·ν·R·T) whatever S, k and the draw
// concentration, so at equal bulk π the SRSF ordering is the ordering of
// B/ν. The identity needs every ion of a salt to cross with one B (then no
// membrane potential arises), so each candidate is given its own single B
// here (scaled by diffusivity: test inputs, not estimates).
func TestSRSFOrderingPhillip(t *testing.T) {
	sc := baseScenario(t, "NaCl", "KCl", "MgCl2", "CaCl2", "Na2SO4", "MgSO4", "NH4Cl", "KBr", "glucose")
	sc.VantHoff = true
	sc.Membrane.UserSoluteB = map[string]float64{}
	for _, s := range sc.Candidates {
		sc.Membrane.UserSoluteB[s.ID] = sc.Membrane.B.NaCl * s.Diffusivity.D0M2PerS / 1.611e-9
	}
	res := run(t, sc)
	type row struct {
		id        string
		srsf, bnu float64
	}
	var rows []row
	for _, r := range res.Ranked {
		nu := r.Solute.Nu()
		want := r.BMPerS / (sc.Membrane.AMPerSPa * nu * thermo.GasConstant * sc.TemperatureK) // mol/m³
		if got := r.Metrics.SRSFMolPerM3; math.Abs(got-want) > 1e-6*want {
			t.Errorf("%s: SRSF %.8g mol/m³, B/(AνRT) = %.8g", r.Solute.ID, got, want)
		}
		rows = append(rows, row{r.Solute.ID, r.Metrics.SRSFMolPerM3, r.BMPerS / nu})
	}
	if len(rows) < 8 {
		t.Fatalf("only %d candidates ranked", len(rows))
	}
	a := append([]row(nil), rows...)
	b := append([]row(nil), rows...)
	// Equal B/ν (KCl and NH4Cl share D) ties within rounding: compare
	// keys rounded to 9 significant figures, ties by name.
	key := func(v float64) float64 { e := math.Pow(10, math.Floor(math.Log10(v))-8); return math.Round(v/e) * e }
	sort.Slice(a, func(i, j int) bool {
		if key(a[i].srsf) != key(a[j].srsf) {
			return key(a[i].srsf) < key(a[j].srsf)
		}
		return a[i].id < a[j].id
	})
	sort.Slice(b, func(i, j int) bool {
		if key(b[i].bnu) != key(b[j].bnu) {
			return key(b[i].bnu) < key(b[j].bnu)
		}
		return b[i].id < b[j].id
	})
	for i := range a {
		if a[i].id != b[i].id {
			t.Fatalf("SRSF order %v differs from B/ν order %v", a, b)
		}
	}
}

// At equal molarity the 2:1 chlorides give more osmotic pressure than the
// 1:1 salts, as their osmotic coefficients say: at 1 mol/kg, φ(MgCl2) ≈
// 1.108, φ(CaCl2) ≈ 1.0, φ(NaCl) = 0.936, φ(KCl) = 0.899 (Robinson &
// Stokes 1959, Appendix 8.10; values from memory), so ν·φ orders
// MgCl2 > CaCl2 > NaCl > KCl.
func TestPiOrderingEqualMolarity(t *testing.T) {
	sc := baseScenario(t, "MgCl2", "CaCl2", "NaCl", "KCl")
	sc.Basis = Basis{Kind: BasisConcentration, Concentration: 1, Unit: thermo.MolPerL}
	res := run(t, sc)
	m := byID(res)
	order := []string{"MgCl2", "CaCl2", "NaCl", "KCl"}
	for i := 1; i < len(order); i++ {
		a, b := m[order[i-1]], m[order[i]]
		if a == nil || b == nil {
			t.Fatalf("missing %s or %s", order[i-1], order[i])
		}
		if !(a.Metrics.PiPa > b.Metrics.PiPa) {
			t.Errorf("π(%s) = %.4g bar not above π(%s) = %.4g bar", order[i-1], a.Metrics.PiPa/1e5, order[i], b.Metrics.PiPa/1e5)
		}
	}
	// νφ ratio MgCl2/NaCl ≈ 3·1.108/(2·0.936) = 1.78 at 1 mol/kg; at
	// 1 mol/L the molalities differ by a few per cent: 8 % tolerance.
	r := m["MgCl2"].Metrics.PiPa / m["NaCl"].Metrics.PiPa
	if math.Abs(r-1.776) > 0.08*1.776 {
		t.Errorf("π(MgCl2)/π(NaCl) = %.3f, want ≈ 1.78", r)
	}
}

// Replenishment cost = SRSF × price, by arithmetic, across the range.
func TestReplenishmentCostArithmetic(t *testing.T) {
	sc := baseScenario(t, "NaCl", "MgCl2", "Na2SO4", "glucose")
	res := run(t, sc)
	for _, r := range res.Ranked {
		p := r.Solute.Price
		if p == nil || !r.Metrics.HasCost {
			t.Fatalf("%s: no price", r.Solute.ID)
		}
		s := r.Metrics.SRSFKgPerM3
		if got, want := r.Metrics.CostMinUSDPerM3, s*p.USDPerKgMin; math.Abs(got-want) > 1e-12*want {
			t.Errorf("%s: min cost %g, want %g", r.Solute.ID, got, want)
		}
		if got, want := r.Metrics.CostMaxUSDPerM3, s*p.USDPerKgMax; math.Abs(got-want) > 1e-12*want {
			t.Errorf("%s: max cost %g, want %g", r.Solute.ID, got, want)
		}
	}
}

// Property: in random metric tables no Pareto member is dominated and
// every non-member is dominated by some row.
func TestParetoProperty(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	dominates := func(a, b [NumObjectives]float64, objs []Objective) bool {
		ge, gt := true, false
		for _, o := range objs {
			va, vb := a[o], b[o]
			if !o.Maximise() {
				va, vb = -va, -vb
			}
			if va < vb {
				ge = false
			}
			if va > vb {
				gt = true
			}
		}
		return ge && gt
	}
	for trial := 0; trial < 500; trial++ {
		n := 1 + rng.IntN(30)
		k := 2 + rng.IntN(4)
		objs := make([]Objective, 0, k)
		for _, p := range rng.Perm(int(NumObjectives))[:k] {
			objs = append(objs, Objective(p))
		}
		vals := make([][NumObjectives]float64, n)
		known := make([][NumObjectives]bool, n)
		for i := range vals {
			for o := range vals[i] {
				vals[i][o] = float64(rng.IntN(6)) // ties on purpose
				known[i][o] = true
			}
		}
		front := ParetoFront(vals, known, objs)
		for b := range vals {
			dominated := false
			for a := range vals {
				if a != b && dominates(vals[a], vals[b], objs) {
					dominated = true
				}
			}
			if front[b] == dominated {
				t.Fatalf("trial %d row %d: front=%v dominated=%v", trial, b, front[b], dominated)
			}
		}
	}
}

// The same seed gives the same robustness figures; the figures are
// probabilities that add up.
func TestRobustnessReproducible(t *testing.T) {
	mk := func(seed uint64) *Result {
		sc := baseScenario(t, "NaCl", "KCl", "MgCl2", "CaCl2", "Na2SO4", "NH4Cl", "KBr", "glucose")
		sc.Feed = seawaterFeed(t)
		sc.Basis = Basis{Kind: BasisOsmoticPressure, MultipleOfFeed: 2}
		sc.Seed = seed
		sc.Uncertainty = &Uncertainty{Samples: 300, ARelSD: .1, BRelSD: .3, SRelSD: .15, DefaultOsmotic: true, DiffusivityRelSD: .05, Prices: true}
		return run(t, sc)
	}
	a, b, c := mk(1), mk(1), mk(2)
	sumFirst, sumTop3 := 0.0, 0.0
	differ := false
	for i := range a.Ranked {
		ra, rb, rc := a.Ranked[i].Robustness, b.Ranked[i].Robustness, c.Ranked[i].Robustness
		if !reflect.DeepEqual(ra, rb) {
			t.Errorf("%s: seed 1 twice gave %+v and %+v", a.Ranked[i].Solute.ID, *ra, *rb)
		}
		if !reflect.DeepEqual(ra, rc) {
			differ = true
		}
		if !(ra.RankP05 <= ra.RankMedian && ra.RankMedian <= ra.RankP95) {
			t.Errorf("%s: rank quantiles out of order %+v", a.Ranked[i].Solute.ID, *ra)
		}
		sumFirst += ra.PFirst
		sumTop3 += ra.PTop3
	}
	if math.Abs(sumFirst-1) > 1e-12 || math.Abs(sumTop3-3) > 1e-12 {
		t.Errorf("Σ P(first) = %g (want 1), Σ P(top3) = %g (want 3)", sumFirst, sumTop3)
	}
	if !differ {
		t.Error("seeds 1 and 2 gave identical robustness figures")
	}
}

// Progress reaches total, and cancellation stops the run with ctx's error.
func TestRobustnessProgressAndCancel(t *testing.T) {
	sc := baseScenario(t, "NaCl", "MgCl2", "KCl")
	sc.Uncertainty = &Uncertainty{Samples: 250, ARelSD: .1, BRelSD: .3, SRelSD: .15, Prices: true}
	last, calls := 0, 0
	if _, err := Run(context.Background(), sc, lib(t), func(done, total int) {
		if done < last || total != 250 {
			t.Errorf("progress %d/%d after %d", done, total, last)
		}
		last = done
		calls++
	}); err != nil {
		t.Fatal(err)
	}
	if last != 250 || calls == 0 {
		t.Errorf("progress ended at %d after %d calls", last, calls)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Run(ctx, sc, lib(t), nil); err != context.Canceled {
		t.Errorf("cancelled run returned %v", err)
	}
}

// Hard limits: an insoluble candidate, a hazard-excluded one and one
// above its model's data are listed apart with their reasons while the
// rest of the screen completes.
func TestExcludedWithReasons(t *testing.T) {
	sc := baseScenario(t, "NaCl", "K2SO4", "KBr", "KHCO3")
	sc.Basis = Basis{Kind: BasisOsmoticPressure, PiPa: 45e5}
	sc.ExcludeHazards = []string{"toxic"}
	res := run(t, sc)
	want := map[string]string{"K2SO4": ReasonInsoluble, "KBr": ReasonHazard, "KHCO3": ReasonValidity}
	got := map[string]string{}
	for _, x := range res.Excluded {
		got[x.Solute.ID] = x.Reason
		if x.Detail == "" {
			t.Errorf("%s excluded without detail", x.Solute.ID)
		}
	}
	for id, r := range want {
		if got[id] != r {
			t.Errorf("%s: reason %q, want %q", id, got[id], r)
		}
	}
	if len(res.Ranked) != 1 || res.Ranked[0].Solute.ID != "NaCl" {
		t.Errorf("ranked %v, want NaCl alone", res.Ranked)
	}
}

// A basis no candidate can reach is an error on basis.value.
func TestUnreachableBasis(t *testing.T) {
	sc := baseScenario(t, "K2SO4", "NaHCO3")
	sc.Basis = Basis{Kind: BasisOsmoticPressure, PiPa: 300e5}
	_, err := Run(context.Background(), sc, lib(t), nil)
	ie, ok := err.(*errs.InputError)
	if !ok || ie.Field != "basis.value" {
		t.Fatalf("got %v, want an InputError on basis.value", err)
	}
}

// Equal water flux: each candidate's flux meets the target.
func TestWaterFluxBasis(t *testing.T) {
	sc := baseScenario(t, "NaCl", "MgCl2", "Na2SO4", "glucose")
	sc.Feed = seawaterFeed(t)
	sc.Basis = Basis{Kind: BasisWaterFlux, JwMPerS: 5 * thermo.MPerSPerLMH}
	res := run(t, sc)
	for _, r := range res.Ranked {
		if got := LMH(r.Metrics.JwMPerS); math.Abs(got-5) > 1e-6 {
			t.Errorf("%s: Jw %.9g LMH, want 5", r.Solute.ID, got)
		}
	}
	if len(res.Ranked) < 3 {
		t.Errorf("only %d ranked; excluded %v", len(res.Ranked), res.Excluded)
	}
}

// Scores: contributions add up to the score; ranks follow the score; the
// normalisation is invariant to the units of a metric (scale and offset).
func TestScoreAndNormalisation(t *testing.T) {
	sc := baseScenario(t, "NaCl", "KCl", "MgCl2", "CaCl2", "NH4Cl", "glucose")
	res := run(t, sc)
	for i, r := range res.Ranked {
		s := 0.0
		for _, c := range r.Contributions {
			s += c
		}
		if math.Abs(s-r.Score) > 1e-12 {
			t.Errorf("%s: contributions sum %g, score %g", r.Solute.ID, s, r.Score)
		}
		if r.Rank != i+1 || (i > 0 && res.Ranked[i-1].Score < r.Score) {
			t.Errorf("rank order broken at %d", i)
		}
	}
	n := len(res.Ranked)
	vals := make([][NumObjectives]float64, n)
	known := make([][NumObjectives]bool, n)
	a, b := make([][NumObjectives]float64, n), make([][NumObjectives]float64, n)
	for i, r := range res.Ranked {
		vals[i], known[i] = r.Values, r.Known
	}
	Normalise(vals, known, a)
	// Another unit: a positive scale on every ratio-scale metric (the unit
	// changes that exist: bar ↔ psi, LMH ↔ GFD, kWh ↔ MJ, g/L ↔ kg/m³);
	// fractions and saturation indices have no other unit.
	for i := range vals {
		for o := range vals[i] {
			if objectives[o].RelRes > 0 {
				vals[i][o] *= 3.6e6
			}
		}
	}
	Normalise(vals, known, b)
	for i := range a {
		for o := range a[i] {
			if math.Abs(a[i][o]-b[i][o]) > 1e-9 {
				t.Fatalf("normalisation depends on units: %g vs %g", a[i][o], b[i][o])
			}
		}
	}
}

// Davies A at 25 °C ≈ 0.509 (e.g. Stumm & Morgan 1996, Table 3.3; from
// memory), used for hydroxyapatite only.
func TestDavies(t *testing.T) {
	if a := daviesA(thermo.ReferenceK); math.Abs(a-0.509) > 0.003 {
		t.Errorf("Davies A(25 °C) = %.4f, want 0.509 ± 0.003", a)
	}
	// Ca 10 mM + SO4 10 mM: I = 0.04; log γ2 = −4A(0.1667 − 0.012).
	a := daviesA(thermo.ReferenceK)
	lg := daviesLogGamma(a, 2, 0.04)
	want := -4 * a * (0.2/1.2 - 0.012)
	if math.Abs(lg-want) > 1e-12 {
		t.Errorf("log γ2 = %g, want %g", lg, want)
	}
}

func mineral(t *testing.T, name string) Mineral {
	t.Helper()
	k, ok := MineralByName(name)
	if !ok {
		t.Fatalf("no mineral %q", name)
	}
	return k
}

// The feed-face saturation index through a whole screen equals the
// mixed-electrolyte model's at the face molalities: a feed of 10 mmol/L
// CaSO4 given by its ions and a membrane with B = 0 (no draw ions reach
// the feed face), so the face holds the feed's ions times the feed's
// polarization factor (read from the flux result). The model's own gypsum
// values are checked against published data in engine/thermo.
func TestScalingFeedFaceGypsum(t *testing.T) {
	gypsum := mineral(t, "gypsum")
	sc := baseScenario(t, "NaCl")
	ions := []library.FeedIon{{Symbol: "Ca+2", Charge: 2, MolarMassGPerMol: 40.078, Concentration: 400.78}, {Symbol: "SO4-2", Charge: -2, MolarMassGPerMol: 96.06, Concentration: 960.6}}
	comp, err := library.NewComposition("caso4", "CaSO4 water", ions)
	if err != nil {
		t.Fatal(err)
	}
	sc.Feed = Feed{ID: "custom", PH: 7, Solute: comp, Concentration: 0.02, Unit: thermo.MolPerL,
		Ions: []library.IonAmount{{Symbol: "Ca+2", Charge: 2, Mol: 0.01}, {Symbol: "SO4-2", Charge: -2, Mol: 0.01}}}
	sc.Membrane.B = library.SoluteB{}
	r := run(t, sc).Ranked[0]
	s := r.Metrics.Scaling
	if r.BMPerS != 0 || !s.Has[gypsum] {
		t.Fatalf("B = %g, gypsum evaluated %v: want 0, true", r.BMPerS, s.Has[gypsum])
	}
	// The same by hand: bulk molality from the feed's own solution, times
	// the face factor the screen used (its surface ionic strength over the
	// bulk's gives it: the ions scale together).
	x, err := thermo.NewSolution(comp, thermo.ReferenceK)
	if err != nil {
		t.Fatal(err)
	}
	mBulk, _ := x.ToMolality(0.02, thermo.MolPerL)
	ionsAt, err := x.IonsAt(mBulk, 7)
	if err != nil {
		t.Fatal(err)
	}
	cf := s.IonicStrengthMolPerL / (ionsAt.IonicStrengthMolPerKg * (x.DensityKgPerM3(mBulk) * (1 - x.MassFraction(mBulk)) / 1000))
	face, err := x.IonsAt(cf*mBulk, 7)
	if err != nil {
		t.Fatal(err)
	}
	for _, sat := range face.Saturation {
		// cf is recovered from ionic strengths that include the H⁺ and OH⁻
		// of the speciation, which do not scale with it: good to ~1e-5.
		if sat.Mineral == "gypsum" && math.Abs(sat.SI-s.SI[gypsum]) > 2e-5 {
			t.Errorf("gypsum SI at the face %.6f, the model at %.4g× the bulk gives %.6f", s.SI[gypsum], cf, sat.SI)
		}
	}
	if !(cf > 1) {
		t.Errorf("feed-side polarization factor %g, want > 1 with water flux", cf)
	}
}

// Plain seawater lies below gypsum saturation in the bulk (published
// practice: gypsum saturates only after about 3–4× evaporation, McCaffrey,
// Lazar & Holland 1987), so the seawater screen with a sodium chloride draw
// raises no gypsum warning.
func TestSeawaterBelowGypsum(t *testing.T) {
	gypsum := mineral(t, "gypsum")
	sc := baseScenario(t, "NaCl")
	sc.Feed = seawaterFeed(t)
	sc.Basis = Basis{Kind: BasisOsmoticPressure, MultipleOfFeed: 2}
	res := run(t, sc)
	if !res.FeedScaling.Has[gypsum] || !(res.FeedScaling.SI[gypsum] < -0.3) {
		t.Errorf("bulk seawater gypsum SI %.3f (evaluated %v), want below −0.3", res.FeedScaling.SI[gypsum], res.FeedScaling.Has[gypsum])
	}
	for _, w := range res.Ranked[0].Warnings {
		if w.Code == warn.Scaling && strings.Contains(w.Text, "gypsum") {
			t.Errorf("NaCl against seawater: %s", w.Text)
		}
	}
}

// A calcium draw meeting a sulfate feed: gypsum supersaturation rises over
// the same screen with a sodium draw (reverse-fluxed Ca²⁺ meets SO4²⁻).
// The hindered-diffusion estimate holds Ca²⁺ back almost entirely, so the
// membrane is given a leaky Ca²⁺ here (our own case) to show the
// mechanism.
func TestScalingCalciumDrawMeetsSulfateFeed(t *testing.T) {
	sc := baseScenario(t, "NaCl", "CaCl2")
	sc.Membrane.UserIonB = map[string]float64{"Ca+2": sc.Membrane.B.NaCl}
	sc.Feed = seawaterFeed(t)
	sc.Basis = Basis{Kind: BasisOsmoticPressure, MultipleOfFeed: 2}
	res := run(t, sc)
	m := byID(res)
	ca, na := m["CaCl2"].Metrics.Scaling, m["NaCl"].Metrics.Scaling
	Gypsum := mineral(t, "gypsum")
	if !ca.Has[Gypsum] || !na.Has[Gypsum] {
		t.Fatal("gypsum not evaluated")
	}
	if !(ca.SI[Gypsum] > na.SI[Gypsum]) {
		t.Errorf("gypsum SI with CaCl2 %.3f not above NaCl's %.3f", ca.SI[Gypsum], na.SI[Gypsum])
	}
	// A deionised feed holds no sulfate: no gypsum index.
	sc2 := baseScenario(t, "CaCl2")
	r2 := run(t, sc2)
	if r2.Ranked[0].Metrics.Scaling.Has[Gypsum] {
		t.Error("gypsum index without sulfate")
	}
}

// Other orientations are reported at the same draw concentration; AL-DS
// gives more flux than AL-FS against a pure-water feed (less dilutive
// ICP on the draw side, McCutcheon & Elimelech 2006).
func TestOtherOrientation(t *testing.T) {
	sc := baseScenario(t, "NaCl", "MgCl2")
	sc.Orientations = []transport.Orientation{transport.ALFS, transport.ALDS}
	res := run(t, sc)
	for _, r := range res.Ranked {
		if len(r.Other) != 1 || r.Other[0].Metrics == nil {
			t.Fatalf("%s: other orientation missing", r.Solute.ID)
		}
		o := r.Other[0].Metrics
		if o.MolalityMolPerKg != r.Metrics.MolalityMolPerKg || !(o.JwMPerS > r.Metrics.JwMPerS) {
			t.Errorf("%s: AL-DS %.3g LMH vs AL-FS %.3g LMH", r.Solute.ID, LMH(o.JwMPerS), LMH(r.Metrics.JwMPerS))
		}
	}
}

// Sweeps: a concentration sweep gives monotone water flux; points beyond
// solubility carry a reason.
func TestSweepConcentration(t *testing.T) {
	sc := baseScenario(t, "NaCl", "K2SO4")
	series, err := Sweep(context.Background(), sc, lib(t), SweepSpec{Variable: SweepConcentration, From: 0.1, To: 2, Points: 20, Unit: thermo.MolPerL})
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range series {
		prev := 0.0
		reasons := 0
		for _, p := range s.Points {
			if p.Metrics == nil {
				reasons++
				if p.Reason == "" {
					t.Errorf("%s: empty point without reason", s.Solute.ID)
				}
				continue
			}
			if !(p.Metrics.JwMPerS > prev) {
				t.Errorf("%s: Jw not increasing at %g", s.Solute.ID, p.X)
			}
			prev = p.Metrics.JwMPerS
		}
		if s.Solute.ID == "K2SO4" && reasons == 0 {
			t.Error("K2SO4 beyond solubility not flagged")
		}
	}
	for _, v := range []SweepSpec{
		{Variable: SweepTemperature, From: 288.15, To: 313.15, Points: 4},
		{Variable: SweepS, From: 100e-6, To: 1000e-6, Points: 4},
		{Variable: SweepCrossflow, From: 0.05, To: 0.5, Points: 4},
	} {
		series, err := Sweep(context.Background(), sc, lib(t), v)
		if err != nil {
			t.Fatal(err)
		}
		p := series[0].Points
		if p[0].Metrics == nil || p[3].Metrics == nil {
			t.Fatalf("sweep %v: missing points", v.Variable)
		}
		up := p[3].Metrics.JwMPerS > p[0].Metrics.JwMPerS
		if (v.Variable == SweepS) == up {
			t.Errorf("sweep %v: Jw %g → %g has the wrong trend", v.Variable, p[0].Metrics.JwMPerS, p[3].Metrics.JwMPerS)
		}
	}
}

// Spreads below an objective's resolution are not stretched over 0–1: two
// energies 2 % apart score 1 and 0.8 (0.02/0.1), two 50 % apart 1 and 0
// (plain min–max); an unknown value is the worst (0).
func TestNormaliseResolution(t *testing.T) {
	o := ObjRegeneration
	for _, tc := range []struct{ lo, hi, want float64 }{{1.00, 1.02, 1 - 0.02/0.102}, {1, 1.5, 0}} {
		vals := make([][NumObjectives]float64, 3)
		known := make([][NumObjectives]bool, 3)
		out := make([][NumObjectives]float64, 3)
		vals[0][o], vals[1][o] = tc.lo, tc.hi
		known[0][o], known[1][o] = true, true
		Normalise(vals, known, out)
		if out[0][o] != 1 || math.Abs(out[1][o]-tc.want) > 1e-12 || out[2][o] != 0 {
			t.Errorf("energies %g, %g: normalised %g, %g, unknown %g; want 1, %g, 0", tc.lo, tc.hi, out[0][o], out[1][o], out[2][o], tc.want)
		}
	}
}

// The robustness figures do not depend on how many goroutines evaluate
// the samples: the draws come from one stream in order and the figures are
// counts, so 1, 2 and 5 workers agree exactly (here with a seawater feed,
// whose scaling buffers each worker owns, and with a sample count that is
// no multiple of the chunk).
func TestRobustnessWorkersIdentical(t *testing.T) {
	defer func(f func() int) { robustWorkers = f }(robustWorkers)
	var want []Ranked
	for _, w := range []int{1, 2, 5} {
		robustWorkers = func() int { return w }
		sc := robustScenario(t, 601)
		r, err := Run(context.Background(), sc, lib(t), nil)
		if err != nil {
			t.Fatal(err)
		}
		if want == nil {
			want = r.Ranked
			continue
		}
		for k := range want {
			if !reflect.DeepEqual(r.Ranked[k].Robustness, want[k].Robustness) {
				t.Errorf("%d workers, %s: %+v; 1 worker: %+v", w, want[k].Solute.ID, *r.Ranked[k].Robustness, *want[k].Robustness)
			}
		}
	}
}

// A robustness run split into parts (Uncertainty.Shard*) adds up to the
// whole run: each part evaluates its own samples of the one stream, and
// the parts' rank counts sum to the whole run's, so the merged figures
// are bit for bit the whole run's (here 3 parts of 601 samples, with 2
// workers inside each part).
func TestRobustnessShardsAddUp(t *testing.T) {
	defer func(f func() int) { robustWorkers = f }(robustWorkers)
	robustWorkers = func() int { return 2 }
	whole, err := Run(context.Background(), robustScenario(t, 601), lib(t), nil)
	if err != nil {
		t.Fatal(err)
	}
	const parts = 3
	n := len(whole.Ranked)
	sum := make([][]int, n)
	samples := 0
	for p := 0; p < parts; p++ {
		sc := robustScenario(t, 601)
		sc.Uncertainty.ShardIndex, sc.Uncertainty.ShardCount = p, parts
		r, err := Run(context.Background(), sc, lib(t), nil)
		if err != nil {
			t.Fatal(err)
		}
		if want := (601 - p + parts - 1) / parts; r.Samples != want {
			t.Errorf("part %d ran %d samples, want %d", p, r.Samples, want)
		}
		samples += r.Samples
		for k := range r.Ranked {
			if r.Ranked[k].Solute.ID != whole.Ranked[k].Solute.ID {
				t.Fatalf("part %d ranks %s where the whole run has %s", p, r.Ranked[k].Solute.ID, whole.Ranked[k].Solute.ID)
			}
			if sum[k] == nil {
				sum[k] = make([]int, n+1)
			}
			for i, c := range r.Ranked[k].Robustness.RankCounts {
				sum[k][i] += c
			}
		}
	}
	if samples != whole.Samples {
		t.Errorf("the parts ran %d samples, the whole run %d", samples, whole.Samples)
	}
	for k := range whole.Ranked {
		if got := RobustnessOf(sum[k]); !reflect.DeepEqual(&got, whole.Ranked[k].Robustness) {
			t.Errorf("%s: merged %+v, whole run %+v", whole.Ranked[k].Solute.ID, got, *whole.Ranked[k].Robustness)
		}
	}
}

// RobustnessOf gives the figures of their definitions over a list of
// ranks: the fractions ranked first, in the top three and failed, and the
// empirical quantiles (the ⌈p·N⌉-th of the sorted ranks).
func TestRobustnessOfCounts(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for trial := 0; trial < 200; trial++ {
		n := 1 + rng.IntN(12)
		ranks := make([]int, 1+rng.IntN(300))
		counts := make([]int, n+1)
		first, top3, failed := 0, 0, 0
		for i := range ranks {
			ranks[i] = 1 + rng.IntN(n+1)
			counts[ranks[i]-1]++
			switch {
			case ranks[i] == n+1:
				failed++
			case ranks[i] <= 3:
				top3++
				if ranks[i] == 1 {
					first++
				}
			}
		}
		sort.Ints(ranks)
		N := len(ranks)
		q := func(p float64) int { return ranks[max(0, int(math.Ceil(p*float64(N)))-1)] }
		got := RobustnessOf(counts)
		want := Robustness{PFirst: float64(first) / float64(N), PTop3: float64(top3) / float64(N), FailedFraction: float64(failed) / float64(N),
			RankP05: q(0.05), RankMedian: q(0.5), RankP95: q(0.95), RankCounts: counts}
		if !reflect.DeepEqual(got, want) {
			t.Fatalf("trial %d (n %d, %d samples): %+v, want %+v", trial, n, N, got, want)
		}
	}
}

// A sweep shared out among workers gives the same series as one worker
// (each point is independent; concentration, S and crossflow sweeps).
func TestSweepWorkersIdentical(t *testing.T) {
	defer func(f func() int) { robustWorkers = f }(robustWorkers)
	for _, spec := range []SweepSpec{
		{Variable: SweepConcentration, From: 0.1, To: 2, Points: 7, Unit: thermo.MolPerL},
		{Variable: SweepS, From: 200e-6, To: 900e-6, Points: 5},
		{Variable: SweepCrossflow, From: 0.05, To: 0.3, Points: 4},
	} {
		var want []SweepSeries
		for _, w := range []int{1, 2, 5} {
			robustWorkers = func() int { return w }
			sc := baseScenario(t, "NaCl", "MgCl2", "glucose", "KCl", "Na2SO4")
			sc.Feed = seawaterFeed(t)
			sc.Orientations = []transport.Orientation{transport.ALFS, transport.ALDS}
			s, err := Sweep(context.Background(), sc, lib(t), spec)
			if err != nil {
				t.Fatal(err)
			}
			if want == nil {
				want = s
				continue
			}
			for k := range want {
				for i := range want[k].Points {
					a, b := want[k].Points[i], s[k].Points[i]
					if a.Reason != b.Reason || (a.Metrics == nil) != (b.Metrics == nil) ||
						a.Metrics != nil && (a.Metrics.JwMPerS != b.Metrics.JwMPerS || a.Metrics.SRSFKgPerM3 != b.Metrics.SRSFKgPerM3) {
						t.Errorf("%v, %d workers, %s %v point %d differs", spec.Variable, w, want[k].Solute.ID, want[k].Orientation, i)
					}
				}
			}
		}
	}
}

// A robustness sample allocates nothing: a run of 1,200 samples makes no
// more heap allocations than one of 200 beyond a bounded few per chunk
// of samples (its goroutines), whatever the candidates failing in it
// (here the seawater scenario, where some miss the basis in a sample).
func TestRobustnessSampleAllocs(t *testing.T) {
	defer func(f func() int) { robustWorkers = f }(robustWorkers)
	robustWorkers = func() int { return 2 }
	allocs := func(samples int) float64 {
		sc := robustScenario(t, samples)
		if _, err := Run(context.Background(), sc, lib(t), nil); err != nil { // prepared solutions built
			t.Fatal(err)
		}
		return testing.AllocsPerRun(3, func() {
			if _, err := Run(context.Background(), sc, lib(t), nil); err != nil {
				t.Fatal(err)
			}
		})
	}
	few, many := allocs(200), allocs(1200)
	if extra := many - few; extra > 16*float64(1200/robustChunk+1) {
		t.Errorf("1,200 samples allocate %.0f times, 200 samples %.0f: %.2f per extra sample", many, few, extra/1000)
	}
	t.Logf("allocations: %.0f for 200 samples, %.0f for 1,200", few, many)
}
