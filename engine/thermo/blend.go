package thermo

import (
	"fmt"
	"math"
	"sort"
	"strings"
	"sync"

	"drawsift/engine/errs"
	"drawsift/engine/internal/roots"
	"drawsift/engine/library"
	"drawsift/engine/warn"
	"drawsift/engine/water"
)

// Paths of a mixture Solution's osmotic model (MixturePath).
const (
	// PathPitzerMixture: the Harvie–Møller–Weare mixed-electrolyte model
	// over the solution's ions (Mixture).
	PathPitzerMixture = "pitzer-mixture"
	// PathZSR: the Zdanovskii–Stokes–Robinson rule over the parts' own
	// binary models, used where the mixed-electrolyte model lacks data.
	PathZSR = "zsr"
)

// maxStackIons bounds the ion count for which mixture evaluations keep
// their scratch on the stack (larger mixtures allocate).
const maxStackIons = 24

// mixModel is the mixed-electrolyte part of a Solution of kind
// library.ModelMixture: a blend of library solutes at a fixed mole ratio,
// or seawater by its Reference Composition. The solution's molality m is
// that of its formula unit; ion i is at per[i]·m.
type mixModel struct {
	path string
	mx   *Mixture  // over the solution's ions, both paths (γ, saturation)
	per  []float64 // ion molality per unit molality, in mx.Ions() order
	sPer float64   // Σ per: particles per formula unit
	// Parts of a blend (nil for seawater), their mole fractions and
	// their own prepared binary Solutions (ZSR, transport properties).
	parts []*Solution
	x     []float64
	props *MixBlend // density and viscosity
	limit int       // the part that saturates first (mixSolubility)
	// The ion-level model for IonsAt (with the carbonate species), built
	// on first use.
	ionsOnce sync.Once
	ions     *ionModel
	ionsErr  error
}

// MixturePath reports which model computes a mixture Solution's osmotic
// properties (PathPitzerMixture or PathZSR), or "" for a single solute.
func (x *Solution) MixturePath() string {
	if x.mix == nil {
		return ""
	}
	return x.mix.path
}

// LimitingPart returns the index of the blend's part that saturates first
// as its molality rises (0 for a single solute or an ion composition).
func (x *Solution) LimitingPart() int {
	if x.mix == nil {
		return 0
	}
	return x.mix.limit
}

// Parts returns a blend's prepared parts and their mole fractions (nil
// for a single solute or seawater).
func (x *Solution) Parts() ([]*Solution, []float64) {
	if x.mix == nil {
		return nil, nil
	}
	return x.mix.parts, x.mix.x
}

// prepareMixture builds the mixture model of x (kind ModelMixture) at
// x.TK: the parts' own Solutions, the ion model, the path, the data limit
// and the solubility limit.
//
// Path: the mixed-electrolyte model when every part is a Pitzer salt (or
// the record is an ion composition such as seawater) and every pair of
// like-charged ions has tabulated mixing parameters; otherwise the
// Zdanovskii–Stokes–Robinson rule (Stokes & Robinson 1966, J. Phys. Chem.
// 70:2126), which needs only each part's binary model, flagged.
//
// Data limit: a blend is within its data while every part's own molality
// x_k·m stays within its binary data and the ionic strength within the
// largest of the parts' binary data (for ZSR: while every part's binary
// molality at the solution's water activity stays within its data).
// Solubility: every part within its own binary solubility, x_k·m ≤
// m_sat,k (the common-ion effect can lower the real limit; the mineral
// saturation indices report it where the minerals are known). Seawater:
// the record's solubility (halite).
func (x *Solution) prepareMixture() error {
	s := x.Solute
	mm := &mixModel{}
	x.mix = mm
	shares := s.IonShares()
	ions := make([]MixIon, 0, len(shares))
	for _, sh := range shares {
		ions = append(ions, MixIon{Symbol: sh.Symbol, Charge: sh.Charge})
		mm.per = append(mm.per, sh.PerUnit)
		mm.sPer += sh.PerUnit
	}
	for _, c := range s.Components {
		p, err := Prepared(c.Solute, x.TK)
		if err != nil {
			return err
		}
		mm.parts = append(mm.parts, p)
		mm.x = append(mm.x, c.MoleFraction)
	}
	electrolytes := len(ions) > 0
	allPitzer := electrolytes
	for _, p := range mm.parts {
		if p.kind != library.ModelPitzer {
			allPitzer = false
		}
		if len(p.Solute.Ions) == 0 {
			electrolytes = false
		}
	}
	if len(ions) > 0 {
		mx, err := NewIonMixture(ions, x.TK)
		if err != nil {
			return err
		}
		// Reorder per to the mixture's ion order.
		per, err := ionVector(mx, shares)
		if err != nil {
			return err
		}
		mm.per = per
		mm.mx = mx
	}
	if !electrolytes && len(mm.parts) == 0 {
		return errs.InvalidText("mixture", s.ID, nil, "a mixture needs ions or parts")
	}
	missing := []string(nil)
	if mm.mx != nil {
		missing = mm.mx.MissingMixing()
	}
	switch {
	case len(mm.parts) == 0: // an ion composition (seawater)
		mm.path = PathPitzerMixture
		x.mixtureWarnings(shares)
	case allPitzer && len(missing) == 0:
		mm.path = PathPitzerMixture
		x.mixtureWarnings(shares)
	default:
		mm.path = PathZSR
		why := "a part is not a Pitzer salt"
		if allPitzer {
			why = "no like-ion mixing parameters for " + strings.Join(missing, ", ")
		}
		x.warn(warn.ModelNote, "%s: osmotic pressure from the Zdanovskii–Stokes–Robinson rule over the parts' binary models (Stokes & Robinson 1966), since %s", s.ID, why)
	}
	for _, p := range mm.parts {
		x.Warnings = append(x.Warnings, p.Warnings...)
	}
	if len(mm.parts) == 0 {
		x.validMolal = math.Inf(1)
		if v := s.Osmotic.MaxMolalityMolPerKg; v > 0 {
			x.validMolal = v
		}
		return nil
	}
	// Data limit (see the doc comment).
	valid := math.Inf(1)
	iMax := 0.0
	for k, p := range mm.parts {
		valid = math.Min(valid, p.validMolal/mm.x[k])
		iMax = math.Max(iMax, ionicStrengthPerMolal(p.Solute)*p.validMolal)
	}
	if mm.path == PathPitzerMixture {
		if iPer := mm.mx.IonicStrength(mm.per); iPer > 0 {
			valid = math.Min(valid, iMax/iPer)
		}
	} else {
		valid = math.Min(valid, mm.zsrValidMolal())
	}
	x.validMolal = valid
	return nil
}

// mixDensity prepares the mixture's density (and viscosity) by the
// multicomponent rules of Laliberté & Cooper (2004) and Laliberté (2007)
// over its parts at their mole ratio, or, for an ion composition, over
// the library salts its ions are assigned to (IonSalts).
func (x *Solution) mixDensity(rhoW, tC float64) (density, error) {
	mm := x.mix
	var b *MixBlend
	var err error
	if len(mm.parts) > 0 {
		sols := make([]*library.Solute, len(mm.parts))
		for k, p := range mm.parts {
			sols[k] = p.Solute
		}
		var p *MixProps
		if p, err = NewMixProps(sols, x.TK); err == nil {
			b, err = p.BlendFromMoles(mm.x)
			x.Warnings = append(x.Warnings, p.Warnings...)
		}
	} else {
		shares := x.Solute.IonShares()
		ions := make([]library.FeedIon, len(shares))
		for k, sh := range shares {
			ions[k] = library.FeedIon{Symbol: sh.Symbol, Charge: sh.Charge, MolarMassGPerMol: sh.MolarMassGPerMol, Concentration: sh.PerUnit * sh.MolarMassGPerMol}
		}
		b, err = NewIonBlend(ions, x.TK)
	}
	if err != nil {
		return density{}, err
	}
	mm.props = b
	return density{kind: densMixture, rhoW: rhoW, tC: tC, mKg: x.mKg, blend: b}, nil
}

// mixViscosity is the mixture's viscosity at solute mass fraction w.
func (x *Solution) mixViscosity(w float64) float64 { return x.mix.props.ViscosityPaS(w) }

// traceShare is the share of a formula unit's particles below which an
// ion counts as a trace in warnings about missing parameters (its terms
// move φ by far less than the model's accuracy).
const traceShare = 1e-3

// mixtureWarnings copies the mixture model's warnings to x, naming the
// pairs without binary or like-ion mixing parameters only where both ions
// are more than traces (and saying how many trace pairs were left out).
func (x *Solution) mixtureWarnings(shares []library.IonShare) {
	mx := x.mix.mx
	major := map[string]bool{}
	for _, sh := range shares {
		if sh.PerUnit >= traceShare*x.mix.sPer {
			major[sh.Symbol] = true
		}
	}
	split := func(pairs []string, sep string) (shown []string, trace int) {
		for _, p := range pairs {
			a, b, _ := strings.Cut(p, sep)
			if major[a] && major[b] {
				shown = append(shown, p)
			} else {
				trace++
			}
		}
		return shown, trace
	}
	note := func(what string, pairs []string, trace int, consequence string) {
		if len(pairs) == 0 && trace == 0 {
			return
		}
		list := strings.Join(pairs, ", ")
		if trace > 0 {
			if list != "" {
				list += "; "
			}
			list += fmt.Sprintf("%d pairs of trace ions (under %g %% of the particles)", trace, 100*traceShare)
		}
		x.warn(warn.ModelNote, "%s: no %s for %s; %s", x.Solute.ID, what, list, consequence)
	}
	for _, w := range mx.Warnings {
		if w.Code == warn.ModelNote && w.Subject == "mixture" {
			continue // restated below
		}
		x.Warnings = append(x.Warnings, w)
	}
	bin, binTrace := split(mx.MissingPairs(), "–")
	note("binary Pitzer parameters", bin, binTrace, "taken as zero (Debye–Hückel and mixing terms only)")
	like, likeTrace := split(mx.MissingMixing(), "/")
	note("like-ion mixing parameters", like, likeTrace, "only the unsymmetrical-mixing terms are included")
}

// ionicStrengthPerMolal returns ½ Σ ν_i z_i² of a salt: its ionic strength
// at 1 mol/kg.
func ionicStrengthPerMolal(s *library.Solute) float64 {
	v := 0.0
	for _, ion := range s.IonShares() {
		v += 0.5 * ion.PerUnit * float64(ion.Charge*ion.Charge)
	}
	return v
}

// mixSolubility returns the molality at which the mixture first reaches
// a solid's saturation: for each part (or for an ion composition, the
// record) that names its minerals (library Solubility.Minerals), the
// molality where the first of them reaches SI = 0 in this mixture, from
// the mixed-electrolyte model's activities (so the common-ion effect is
// included); a part without minerals is held within its own binary
// solubility, x_k·m ≤ m_sat,k. An ion composition without minerals
// falls back on its record's points (ok false).
func (x *Solution) mixSolubility(tC float64) (float64, bool) {
	mm := x.mix
	sol := math.Inf(1)
	if len(mm.parts) == 0 {
		if len(x.Solute.Solubility.Minerals) == 0 || mm.mx == nil {
			return 0, false
		}
		for _, name := range x.Solute.Solubility.Minerals {
			sol = math.Min(sol, mm.onset(name))
		}
		if math.IsInf(sol, 0) {
			return 0, false
		}
		return sol, true
	}
	for k, p := range mm.parts {
		own := p.solMolal / mm.x[k]
		if names := p.Solute.Solubility.Minerals; len(names) > 0 && mm.mx != nil {
			on := math.Inf(1)
			for _, name := range names {
				on = math.Min(on, mm.onset(name))
			}
			if !math.IsInf(on, 0) {
				own = on
			}
		}
		if own < sol {
			sol, mm.limit = own, k
		}
	}
	return sol, true
}

// onsetMaxMolal bounds the search for a mineral's onset (mol/kg of the
// formula unit): past it the mineral is taken as never saturating.
const onsetMaxMolal = 60

// onset returns the molality of the formula unit at which mineral reaches
// SI = 0 in the mixture (Brent's method on SI(m), which rises with m for
// a mineral made of the mixture's own ions), or +Inf if it does not below
// onsetMaxMolal or the mineral's ions are not all present.
func (mm *mixModel) onset(mineral string) float64 {
	ion := make([]float64, len(mm.per))
	si := func(m float64) float64 {
		for i, p := range mm.per {
			ion[i] = p * m
		}
		for _, s := range mm.mx.SaturationIndices(ion) {
			if s.Mineral == mineral {
				return s.SI
			}
		}
		return math.NaN()
	}
	lo, hi := 1e-3, 1.0
	flo := si(lo)
	if math.IsNaN(flo) {
		return math.Inf(1)
	}
	fhi := si(hi)
	for fhi < 0 && hi < onsetMaxMolal {
		lo, flo = hi, fhi
		hi = math.Min(2*hi, onsetMaxMolal)
		fhi = si(hi)
	}
	if !(fhi >= 0) || flo >= 0 {
		if flo >= 0 {
			return lo
		}
		return math.Inf(1)
	}
	r, _ := roots.Brent(si, roots.Bracket{Lo: lo, Hi: hi, FLo: flo, FHi: fhi},
		&roots.Settings{Solver: mineral + " saturation onset", XRelTol: 1e-10, FAbsTol: 1e-10})
	return r.X
}

// mixPhi returns g = m·(Σper/ν)·φ and dg/dm for the mixture (ν·g is the
// total osmolality, Σ mᵢ φ). The Pitzer path evaluates the mixture at
// the ion molalities; dg/dm is the five-point central difference along
// the composition ray (step 10⁻³·m; truncation and rounding both near
// 10⁻¹² relative). ZSR: see zsrOsmolality.
func (x *Solution) mixPhi(m float64) (g, dg float64) {
	mm := x.mix
	if mm.path == PathZSR {
		om, dom := mm.zsrOsmolality(m)
		return om / x.nu, dom / x.nu
	}
	f := func(t float64) float64 { return t * mm.sPer * mm.phiAt(t) }
	om := f(m)
	h := 1e-3 * m
	dom := (f(m-2*h) - 8*f(m-h) + 8*f(m+h) - f(m+2*h)) / (12 * h)
	return om / x.nu, dom / x.nu
}

// phiAt evaluates the mixture's φ at total molality m (Pitzer path).
func (mm *mixModel) phiAt(m float64) float64 {
	var buf [maxStackIons]float64
	var ion []float64
	if len(mm.per) <= maxStackIons {
		ion = buf[:len(mm.per)]
	} else {
		ion = make([]float64, len(mm.per))
	}
	for i, p := range mm.per {
		ion[i] = p * m
	}
	return mm.mx.Eval(ion, nil)
}

// zsrOsmolality returns the total osmolality Ω = −ln a_w / M_w of a blend
// at molality m by the Zdanovskii–Stokes–Robinson rule
//
//	Σ_k m_k / m°_k(a_w) = 1,   m_k = x_k m
//
// with m°_k(a_w) the molality of part k alone at the same water activity
// (Stokes & Robinson 1966, J. Phys. Chem. 70:2126, eq. 1), and dΩ/dm by
// implicit differentiation:
//
//	dΩ/dm = (Σ x_k/m°_k) / (Σ x_k m /(m°_k² · dΩ_k/dm°_k))
//
// Ω lies between the smallest and largest of the parts' Ω_k(m) (each
// Ω_k increasing), which brackets the root.
func (mm *mixModel) zsrOsmolality(m float64) (om, dom float64) {
	if m <= 0 {
		return 0, mm.zsrDilute()
	}
	lo, hi := math.Inf(1), 0.0
	for _, p := range mm.parts {
		o, _ := p.osmolalityMono(m)
		lo, hi = math.Min(lo, o), math.Max(hi, o)
	}
	resid := func(o float64) float64 {
		sum := 0.0
		for k, p := range mm.parts {
			sum += mm.x[k] * m / p.molalityForOsmolality(o)
		}
		return sum - 1
	}
	if hi-lo <= 1e-14*hi {
		om = hi
	} else {
		r, err := roots.Brent(resid,
			roots.Bracket{Lo: lo, Hi: hi, FLo: resid(lo), FHi: resid(hi)},
			&roots.Settings{Solver: "Zdanovskii–Stokes–Robinson water activity", XRelTol: 1e-14, FAbsTol: 1e-15})
		om = r.X
		if err != nil && !(om > 0) {
			om = 0.5 * (lo + hi)
		}
	}
	var num, den float64
	for k, p := range mm.parts {
		m0 := p.molalityForOsmolality(om)
		_, d0 := p.osmolalityMono(m0)
		num += mm.x[k] / m0
		den += mm.x[k] * m / (m0 * m0 * d0)
	}
	return om, num / den
}

// zsrDilute returns dΩ/dm at m → 0: Σ x_k ν_k (ideal dilute limit).
func (mm *mixModel) zsrDilute() float64 {
	d := 0.0
	for k, p := range mm.parts {
		d += mm.x[k] * p.nu
	}
	return d
}

// zsrValidMolal returns the blend molality at which the ZSR solution's
// water activity reaches the first part's data limit (each part's binary
// molality at that water activity equals its data limit).
func (mm *mixModel) zsrValidMolal() float64 {
	lim := math.Inf(1)
	for _, p := range mm.parts {
		if !math.IsInf(p.validMolal, 0) {
			o, _ := p.osmolalityMono(p.validMolal)
			lim = math.Min(lim, o)
		}
	}
	if math.IsInf(lim, 0) {
		return lim
	}
	return invertIncreasing(mm.zsrOsmolality, lim, 1, 0.5, "ZSR data limit")
}

// invertIncreasing returns the m ≥ 0 at which the increasing f (value and
// slope, f(0) = 0) reaches target > 0: the bracket [0, hi] doubles from
// hi0 until it holds the target, then a safeguarded Newton iteration
// (internal/roots) from guess·hi.
func invertIncreasing(f func(float64) (float64, float64), target, hi0, guess float64, solver string) float64 {
	hi := hi0
	for k := 0; k < 80; k++ {
		if v, _ := f(hi); v >= target {
			break
		}
		hi *= 2
	}
	g := func(m float64) (float64, float64) {
		v, d := f(m)
		return v - target, d
	}
	fhi, _ := g(hi)
	r, err := roots.Newton(g, roots.Bracket{Lo: 0, Hi: hi, FLo: -target, FHi: fhi}, guess*hi,
		&roots.Settings{Solver: solver, XRelTol: 1e-15, FAbsTol: 1e-14 * target, Scale: target})
	if err != nil && !(r.X > 0) {
		return hi
	}
	return r.X
}

// osmolalityMono returns a single solute's total osmolality Ω = ν·m·φ
// and dΩ/dm at any m ≥ 0, as the ZSR rule uses it: the model inside the
// working range and, beyond it, a straight line in molality with the
// slope at the top of the range (positive there by construction), so the
// inverse is defined for every Ω. Results past the parts' data carry the
// blend's data-limit warning.
func (x *Solution) osmolalityMono(m float64) (om, dom float64) {
	if m <= x.capMolal {
		pi, dp := x.piM(m)
		return pi / x.piPerG, dp / x.piPerG
	}
	pi, dp := x.piM(x.capMolal)
	if !(dp > 0) {
		dp = x.nu * x.piPerG
	}
	return (pi + dp*(m-x.capMolal)) / x.piPerG, dp / x.piPerG
}

// molalityForOsmolality inverts osmolalityMono (safeguarded Newton in a
// doubling bracket); used by the ZSR rule.
func (x *Solution) molalityForOsmolality(om float64) float64 {
	if om <= 0 {
		return 0
	}
	return invertIncreasing(x.osmolalityMono, om, om/x.nu*2, 0.5, "binary molality at a water activity")
}

// ionVector places the ions per formula unit in the mixture's order.
func ionVector(mx *Mixture, shares []library.IonShare) ([]float64, error) {
	per := make([]float64, len(mx.Ions()))
	for _, sh := range shares {
		i, ok := mx.Index(sh.Symbol)
		if !ok {
			return nil, fmt.Errorf("thermo: ion %s missing from its mixture model", sh.Symbol)
		}
		per[i] += sh.PerUnit
	}
	return per, nil
}

// IonState is one ion of a solution at a concentration.
type IonState struct {
	Symbol           string
	Charge           int
	MolalityMolPerKg float64
	// LnGamma is the ion's ln γ on the mixed-electrolyte model's scale
	// (the MacInnes convention is not applied: single-ion values are
	// those of the Pitzer equations); valid when HasGamma.
	LnGamma  float64
	HasGamma bool
}

// IonicState is a solution's ion-level description at one molality: its
// ions, ionic strength and mineral saturation indices.
type IonicState struct {
	Ions                  []IonState
	IonicStrengthMolPerKg float64
	Saturation            []Saturation
	// PH is the pH of the closed carbonate system (free-H⁺ activity
	// scale of the model) when the solution holds carbonate; HasPH.
	PH       float64
	HasPH    bool
	Warnings []warn.Warning
}

// IonsAt returns the ion-level state of the solution at molality m: every
// ion's molality and, from the mixed-electrolyte model, its activity
// coefficient, the ionic strength and the saturation indices of the
// minerals whose ions are present. For a single Pitzer salt the
// mixed-electrolyte model over its two ions reduces to the salt's own
// equations (TestMixtureSingleSaltLimit). A non-electrolyte has no ions.
// Saturation indices of a ZSR blend use the mixed-electrolyte model's
// activities (flagged).
//
// Carbonate: with HCO₃⁻ or CO₃²⁻ present the carbonate system is
// speciated at pH (when it is a number in 0–14), else at the pH of the
// composition's own water record (seawater: its preset's), else as a
// closed system of the given DIC and alkalinity (the pH follows). The
// model has no carbonate ion pairs (CaCO₃°, MgCO₃°), so a closed-system pH
// from a composition whose carbonate was apportioned with them runs high;
// a measured pH is the better input.
func (x *Solution) IonsAt(m, pH float64) (IonicState, error) {
	var st IonicState
	shares := x.Solute.IonShares()
	if len(shares) == 0 {
		return st, nil
	}
	var im *ionModel
	var err error
	if x.mix != nil {
		x.mix.ionsOnce.Do(func() { x.mix.ions, x.mix.ionsErr = newIonModel(shares, x.TK) })
		im, err = x.mix.ions, x.mix.ionsErr
	} else {
		im, err = newIonModel(shares, x.TK)
	}
	if err != nil {
		return st, err
	}
	mx := im.mx
	mi := make([]float64, len(im.per))
	for i, p := range im.per {
		mi[i] = p * m
	}
	if !(pH >= 0 && pH <= 14) {
		if f, ok := library.LookupFeed(x.Solute.Osmotic.CompositionFeed); ok && x.Solute.Osmotic.CompositionFeed != "" {
			pH = f.PH
		}
	}
	if im.carbonate && m > 0 {
		var sp []float64
		var err error
		if pH >= 0 && pH <= 14 {
			sp, err = mx.SpeciateCarbonate(mi, pH)
		} else {
			// Closed system: the HCO₃⁻ and CO₃²⁻ give DIC and alkalinity.
			ix, _ := mx.Index("HCO3-")
			jx, _ := mx.Index("CO3-2")
			sp, pH, err = mx.SpeciateAlkalinity(mi, mi[ix]+mi[jx], mi[ix]+2*mi[jx])
		}
		if err == nil {
			mi, st.PH, st.HasPH = sp, pH, true
		} else {
			st.Warnings = append(st.Warnings, warn.New(warn.ModelNote, x.Solute.ID,
				"%s: carbonate speciation did not converge (%v); carbonate ions taken as given", x.Solute.ID, err))
		}
	}
	lng := make([]float64, len(mi))
	mx.Eval(mi, lng)
	gammaOK := x.kind == library.ModelPitzer || x.mix != nil
	for i, ion := range mx.Ions() {
		if mi[i] == 0 && im.added[i] {
			continue // a carbonate species absent at this pH
		}
		st.Ions = append(st.Ions, IonState{Symbol: ion.Symbol, Charge: ion.Charge, MolalityMolPerKg: mi[i],
			LnGamma: lng[i], HasGamma: gammaOK && !math.IsNaN(lng[i]) && !math.IsInf(lng[i], 0)})
	}
	st.IonicStrengthMolPerKg = mx.IonicStrength(mi)
	st.Saturation = mx.SaturationIndices(mi)
	for _, s := range st.Saturation {
		st.Warnings = append(st.Warnings, s.Warnings...)
	}
	if x.mix != nil && x.mix.path == PathZSR && len(st.Saturation) > 0 {
		st.Warnings = append(st.Warnings, warn.New(warn.ModelNote, x.Solute.ID,
			"%s: saturation indices use the mixed-electrolyte model's activities, though the osmotic pressure comes from the ZSR rule", x.Solute.ID))
	}
	if x.kind != library.ModelPitzer && x.mix == nil {
		st.Warnings = append(st.Warnings, warn.New(warn.ModelNote, x.Solute.ID,
			"%s: ion activity coefficients are not reported, the solute's osmotic model is not a Pitzer one", x.Solute.ID))
	}
	return st, nil
}

// ionModel is the mixed-electrolyte model over a solution's ions (and the
// carbonate species when it holds HCO₃⁻ or CO₃²⁻), for IonsAt.
type ionModel struct {
	mx        *Mixture
	per       []float64 // ion molality per unit molality
	added     []bool    // species added for the carbonate system
	carbonate bool
}

func newIonModel(shares []library.IonShare, tK float64) (*ionModel, error) {
	im := &ionModel{}
	ions := make([]MixIon, 0, len(shares)+5)
	have := map[string]bool{}
	for _, sh := range shares {
		ions = append(ions, MixIon{Symbol: sh.Symbol, Charge: sh.Charge})
		have[sh.Symbol] = true
	}
	im.carbonate = have["HCO3-"] || have["CO3-2"]
	if im.carbonate {
		for _, c := range CarbonateIons() {
			if !have[c.Symbol] {
				ions = append(ions, c)
				have[c.Symbol] = true
			}
		}
	}
	mx, err := NewIonMixture(ions, tK)
	if err != nil {
		return nil, err
	}
	per, err := ionVector(mx, shares)
	if err != nil {
		return nil, err
	}
	im.mx, im.per = mx, per
	im.added = make([]bool, len(per))
	for i, p := range per {
		im.added[i] = p == 0
	}
	return im, nil
}

// mixDiffusivity returns a blend's effective diffusivity at molality m:
// the osmotically weighted harmonic mean of its parts' own diffusivities
// (each at its own molality x_k·m),
//
//	1/D = Σ_k (x_k ν_k / ν) / D_k
//
// which matches the blend's internal-polarisation factor Σ (x_kν_k/ν)·
// exp(−Jw·S/D_k) to first order in Jw·S/D (derived here; the parts share
// one concentration profile in the transport model). Seawater: the
// record's value.
func (x *Solution) mixDiffusivity(m float64) (float64, bool) {
	mm := x.mix
	if mm == nil || len(mm.parts) == 0 {
		return 0, false
	}
	inv := 0.0
	for k, p := range mm.parts {
		inv += mm.x[k] * p.nu / x.nu / p.DiffusivityM2PerS(mm.x[k]*m)
	}
	return 1 / inv, true
}

// knownIons maps every ion symbol the mixed-electrolyte model has data
// for (an ion of a library salt or of the mixing tables) to its charge.
var knownIons = sync.OnceValue(func() map[string]int {
	out := map[string]int{}
	if lib, err := library.Default(); err == nil {
		for _, s := range lib.All() {
			for _, ion := range s.IonShares() {
				out[ion.Symbol] = ion.Charge
			}
		}
	}
	for _, sym := range pairTableIons() {
		if z, ok := chargeOfSymbol(sym); ok {
			out[sym] = z
		}
	}
	return out
})

// chargeOfSymbol reads the charge from an ion symbol's suffix: "Na+" → 1,
// "Ca+2" → 2, "SO4-2" → −2, "Cl-" → −1.
func chargeOfSymbol(sym string) (int, bool) {
	i := strings.LastIndexAny(sym, "+-")
	if i <= 0 {
		return 0, false
	}
	sign := 1
	if sym[i] == '-' {
		sign = -1
	}
	if i == len(sym)-1 {
		return sign, true
	}
	n := 0
	for _, r := range sym[i+1:] {
		if r < '0' || r > '9' {
			return 0, false
		}
		n = 10*n + int(r-'0')
	}
	return sign * n, n > 0
}

// KnownIonCharge returns the charge of an ion the mixed-electrolyte model
// knows, and whether it knows it.
func KnownIonCharge(symbol string) (int, bool) {
	z, ok := knownIons()[symbol]
	return z, ok
}

// KnownIonSymbols lists the ions the mixed-electrolyte model knows, sorted.
func KnownIonSymbols() []string {
	out := make([]string, 0, len(knownIons()))
	for s := range knownIons() {
		out = append(out, s)
	}
	sort.Strings(out)
	return out
}

// pairTableIons lists the ions of the pair and mixing tables.
func pairTableIons() []string {
	var out []string
	for k := range pairTable {
		out = append(out, k[0], k[1])
	}
	for k := range mixTheta {
		out = append(out, k[0], k[1])
	}
	for k := range mixPsi {
		out = append(out, k[0], k[1], k[2])
	}
	for k := range lambdaNeutral {
		out = append(out, k[0], k[1])
	}
	return out
}

// OsmoticPressureGradient sets grad[i] = ∂π/∂mᵢ (Pa·kg/mol) at the
// molalities m, with π = (RT M_w/V̄_w)·Ω and Ω = φ Σⱼ mⱼ the osmolality.
// From Ω = Σm + Σⱼ mⱼ ln γⱼ − Gᴱˣ/(w_w RT) and ln γᵢ = ∂(Gᴱˣ/w_w RT)/∂mᵢ
// (Pitzer 1991 eq. 3-59) with the symmetry of the second derivatives,
//
//	∂Ω/∂mᵢ = 1 + Σⱼ mⱼ ∂ln γᵢ/∂mⱼ = 1 + d ln γᵢ(t·m)/dt |_{t=1}
//
// one directional derivative for the whole gradient, taken by the
// five-point central difference in t (step 10⁻³; checked against finite
// differences of Ω in TestOsmoticPressureGradient). grad needs len(m).
func (mx *Mixture) OsmoticPressureGradient(m, grad []float64) {
	n := len(m)
	mt := make([]float64, n)
	lg := make([]float64, n)
	for i := range grad {
		grad[i] = 0
	}
	const h = 1e-3
	for _, st := range [4]struct{ t, w float64 }{{1 - 2*h, 1}, {1 - h, -8}, {1 + h, 8}, {1 + 2*h, -1}} {
		for i := range m {
			mt[i] = st.t * m[i]
		}
		mx.Eval(mt, lg)
		for i := range grad {
			grad[i] += st.w * lg[i]
		}
	}
	tK := mx.TemperatureK()
	k := GasConstant * tK * water.MolarMassKgPerMol / water.MolarVolume(tK)
	for i := range grad {
		grad[i] = k * (1 + grad[i]/(12*h))
	}
}
