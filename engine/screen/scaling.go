package screen

import (
	"math"

	"drawsift/engine/thermo"
	"drawsift/engine/transport"
	"drawsift/engine/warn"
	"drawsift/engine/water"
)

// Mineral is a common scalant checked at the feed-side membrane surface.
type Mineral int

// Minerals checked.
const (
	Gypsum         Mineral = iota // CaSO4·2H2O
	Calcite                       // CaCO3
	Brucite                       // Mg(OH)2
	Hydroxyapatite                // Ca5(PO4)3OH
	NumMinerals
)

type mineralInfo struct {
	Name, Formula string
	LogK          float64 // at 25 °C, for the reaction in Reaction
	Reaction      string
	Source        string
}

// minerals: log K at 25 °C from the WATEQ4F thermodynamic data set (Ball &
// Nordstrom 1991, USGS Open-File Report 91-183) as carried by the
// phreeqc.dat and wateq4f.dat databases of PHREEQC (Parkhurst & Appelo
// 2013).
var minerals = [NumMinerals]mineralInfo{
	Gypsum: {"gypsum", "CaSO4·2H2O", -4.58, "CaSO4:2H2O = Ca+2 + SO4-2 + 2 H2O",
		"phreeqc.dat, log_k −4.58 (verified as printed in the database)"},
	Calcite: {"calcite", "CaCO3", -8.48, "CaCO3 = Ca+2 + CO3-2",
		"phreeqc.dat, log_k −8.48 (from memory)"},
	Brucite: {"brucite", "Mg(OH)2", 16.84, "Mg(OH)2 + 2 H+ = Mg+2 + 2 H2O",
		"wateq4f.dat, log_k 16.84 (value seen quoted from the database; from memory)"},
	Hydroxyapatite: {"hydroxyapatite", "Ca5(PO4)3OH", -3.421, "Ca5(PO4)3OH + 4 H+ = H2O + 3 HPO4-2 + 5 Ca+2",
		"phreeqc.dat, log_k −3.421 (from memory)"},
}

// Acid–base constants at 25 °C used to speciate carbonate and phosphate at
// the surface pH (phreeqc.dat; from memory).
const (
	logK2Carbonate = -10.329 // HCO3- = CO3-2 + H+
	logK2Phosphate = -7.20   // H2PO4- = HPO4-2 + H+
)

// Name returns the mineral's name.
func (m Mineral) Name() string { return minerals[m].Name }

// Formula returns the mineral's formula.
func (m Mineral) Formula() string { return minerals[m].Formula }

// Source names the solubility product used.
func (m Mineral) Source() string { return minerals[m].Source }

// ScalingMethod names the method of the scaling check.
const ScalingMethod = "Saturation index SI = log10(IAP/Ksp) at the feed-side face of the active layer. " +
	"Ion concentrations there: the feed's ions times the feed-side concentration-polarization factor (the feed solute's face/bulk ratio " +
	"from the flux model, or exp(Jw·R) on the feed side), plus the reverse-fluxed draw ions at the draw solute's feed-face concentration. " +
	"Free-ion activities from the Davies equation (Davies 1962; A from water's dielectric constant), no ion pairing; molarity taken as molality. " +
	"pH held at the feed's bulk value; carbonate and phosphate speciated at that pH (pK2 10.329 and 7.20). " +
	"log Ksp at 25 °C from the WATEQ4F data set as carried by PHREEQC's phreeqc.dat/wateq4f.dat (Ball & Nordstrom 1991; Parkhurst & Appelo 2013): " +
	"gypsum −4.58 (verified), calcite −8.48, brucite 16.84 (proton form), hydroxyapatite −3.421 (from memory). " +
	"Above I ≈ 0.5 mol/L the Davies equation and the neglect of ion pairs overstate supersaturation (e.g. gypsum in seawater): a screening flag, not a design check."

// Scaling holds the saturation indices at the feed-side surface.
type Scaling struct {
	SI  [NumMinerals]float64
	Has [NumMinerals]bool // the ions of that mineral are present
	Any bool
	// Max is the highest SI among the minerals present.
	Max                  float64
	IonicStrengthMolPerL float64
}

// daviesA returns the Davies/Debye–Hückel constant A (log10 units, kg^½
// mol^−½) at tK:
//
//	A = 1.82483e6 · √ρ_w · (ε_r T)^(−3/2)
//
// with ρ_w in g/cm³ (e.g. Stumm & Morgan, Aquatic Chemistry, 3rd ed.,
// 1996, ch. 3; the constant 1.82483e6 from memory). About 0.509 at 25 °C.
func daviesA(tK float64) float64 {
	rho := water.Density(tK) / 1000
	eps := water.DielectricConstant(tK)
	return 1.82483e6 * math.Sqrt(rho) * math.Pow(eps*tK, -1.5)
}

// daviesLogGamma returns log10 γ of an ion of charge z at ionic strength I
// (mol/L) by the Davies (1962) equation:
//
//	log10 γ = −A z² (√I/(1 + √I) − 0.3 I)
//
// Valid to I ≈ 0.5 mol/L.
func daviesLogGamma(a float64, z int, i float64) float64 {
	s := math.Sqrt(i)
	return -a * float64(z*z) * (s/(1+s) - 0.3*i)
}

// Slots of the ions the minerals need.
const (
	slotCa = iota
	slotMg
	slotSO4
	slotHCO3
	slotCO3
	slotHPO4
	slotH2PO4
	slotPO4
	numSlots
)

func slotOf(symbol string) int {
	switch symbol {
	case "Ca+2":
		return slotCa
	case "Mg+2":
		return slotMg
	case "SO4-2":
		return slotSO4
	case "HCO3-":
		return slotHCO3
	case "CO3-2":
		return slotCO3
	case "HPO4-2":
		return slotHPO4
	case "H2PO4-":
		return slotH2PO4
	case "PO4-3":
		return slotPO4
	}
	return -1
}

// scaling fills s from the converged flux result r of candidate c.
func (e *env) scaling(c *candidate, ori transport.Orientation, r *transport.Result, s *Scaling) {
	*s = Scaling{}
	// Feed-side polarization factor of the feed's ions.
	cf := 1.0
	if e.feedSol != nil && e.feedC > 0 {
		if e.feedSol != c.sol && len(r.Species) > 1 {
			cf = r.Species[1].FeedFaceMolPerM3 / e.feedC
		} else {
			rf := 0.0
			if !math.IsInf(e.kFeed, 1) && e.kFeed > 0 {
				rf = 1 / e.kFeed
			}
			if ori == transport.ALDS {
				rf += e.sc.Membrane.SM / e.feedD
			}
			cf = math.Exp(math.Min(r.JwMPerS*rf, 50))
		}
	}
	// Draw solute at the feed face beyond what the feed itself brings.
	drawFace := r.Species[0].FeedFaceMolPerM3
	if e.feedSol == c.sol && !e.sc.Feed.Surrogate {
		drawFace -= e.feedC * cf
	}
	drawFace = math.Max(0, drawFace) / 1000 // mol/L

	var conc [numSlots]float64
	i2 := 0.0 // Σ c z²
	for _, ion := range e.feedIons {
		v := ion.molPerL * cf
		i2 += v * float64(ion.charge*ion.charge)
		if k := slotOf(ion.symbol); k >= 0 {
			conc[k] += v
		}
	}
	for _, ion := range c.ions {
		v := ion.count * drawFace
		i2 += v * float64(ion.charge*ion.charge)
		if k := slotOf(ion.symbol); k >= 0 {
			conc[k] += v
		}
	}
	is := 0.5 * i2
	s.IonicStrengthMolPerL = is
	a := e.davies
	g1 := math.Pow(10, daviesLogGamma(a, 1, is))
	g2 := math.Pow(10, daviesLogGamma(a, 2, is))
	ph := e.sc.Feed.PH
	aH := math.Pow(10, -ph)
	logCa := math.Log10(g2 * conc[slotCa])
	set := func(m Mineral, si float64) {
		if math.IsNaN(si) || math.IsInf(si, 0) {
			return
		}
		s.SI[m], s.Has[m] = si, true
		if !s.Any || si > s.Max {
			s.Max = si
		}
		s.Any = true
	}
	if conc[slotCa] > 0 && conc[slotSO4] > 0 {
		set(Gypsum, logCa+math.Log10(g2*conc[slotSO4])-minerals[Gypsum].LogK)
	}
	if ct := conc[slotHCO3] + conc[slotCO3]; conc[slotCa] > 0 && ct > 0 {
		rr := math.Pow(10, logK2Carbonate) * g1 / (g2 * aH) // [CO3]/[HCO3]
		co3 := ct * rr / (1 + rr)
		set(Calcite, logCa+math.Log10(g2*co3)-minerals[Calcite].LogK)
	}
	if conc[slotMg] > 0 {
		set(Brucite, math.Log10(g2*conc[slotMg])+2*ph-minerals[Brucite].LogK)
	}
	if pt := conc[slotHPO4] + conc[slotH2PO4] + conc[slotPO4]; conc[slotCa] > 0 && pt > 0 {
		rr := math.Pow(10, logK2Phosphate) * g1 / (g2 * aH) // [HPO4]/[H2PO4]
		hpo4 := pt * rr / (1 + rr)
		set(Hydroxyapatite, 5*logCa+3*math.Log10(g2*hpo4)+4*ph-minerals[Hydroxyapatite].LogK)
	}
}

// scalingWarnings are the scenario-level caveats of the scaling check.
func scalingWarnings(tK float64) []warn.Warning {
	if math.Abs(tK-thermo.ReferenceK) > 5 {
		return []warn.Warning{warn.New(warn.Temperature25C, "scaling", "scaling: solubility products are 25 °C values, used unchanged at this temperature")}
	}
	return nil
}
