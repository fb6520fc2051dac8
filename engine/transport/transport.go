// Package transport computes steady-state water and solute fluxes across a
// forward-osmosis (FO) membrane, with internal concentration polarization
// (ICP) in the porous support, external concentration polarization (ECP) in
// the boundary layers on both faces, solute leakage through the active layer
// in both directions, and a hydraulic pressure difference.
//
// # Model
//
// One-dimensional steady state, x running from the feed bulk to the draw
// bulk. The water flux Jw (m/s) is positive from feed to draw. For each solute
// species j the net molar flux N_j (mol m⁻² s⁻¹, positive feed → draw) is the
// same in every layer. In an unstirred layer (boundary layer of resistance
// 1/k, support of resistance S/D_j) convection and diffusion give
//
//	N = Jw·c − D·dc/dx   ⇒   c_out − u = (c_in − u)·exp(Jw·R),   u = N/Jw,
//
// across a layer of resistance R (s/m). Orientation decides which resistances
// lie on each side of the active layer:
//
//	AL-FS (FO mode):  R_f = 1/k_F,          R_d = S/D_j + 1/k_D
//	AL-DS (PRO mode): R_f = S/D_j + 1/k_F,  R_d = 1/k_D
//
// The active layer passes solute as N_j = B_j·(c_j,f − c_j,d), with f and d the
// feed and draw faces of the active layer. Eliminating u gives
//
//	N_j = B_j·(c_Fb·e^{Jw R_f} − c_Db·e^{−Jw R_d})
//	      / (1 + B_j·[(e^{Jw R_f} − 1)/Jw + (1 − e^{−Jw R_d})/Jw])
//	c_j,f = c_Fb·e^{Jw R_f} − N_j·(e^{Jw R_f} − 1)/Jw
//	c_j,d = c_Db·e^{−Jw R_d} + N_j·(1 − e^{−Jw R_d})/Jw
//
// and the water flux closes the system:
//
//	Jw = A·(π_d − π_f − ΔP),   π_face = Σ_j Π_j(c_j,face).
//
// The osmotic pressure of a face holding two species uses the additive
// osmotic pressure rule: each solute contributes its own non-ideal π at its
// own concentration. The rule is exact in the van 't Hoff limit and an
// approximation otherwise (it ignores solute–solute interactions).
//
// The exponentials are concentration factors: the face concentrations come
// from them and π is evaluated from the solute's own (non-ideal) model at
// those concentrations, never by multiplying a non-ideal π by the
// exponentials. With a linear Π = ν·R·T·c and one species the equations are
// exactly those of Tiraferri et al. (2011, J. Membr. Sci. 367:340; 2013,
// J. Membr. Sci. 444:523) for reverse solute flux, McCutcheon & Elimelech
// (2006, J. Membr. Sci. 284:237) for ICP when B = 0, Yip et al. (2011,
// Environ. Sci. Technol. 45:4360) with ΔP, and they give the specific reverse
// solute flux Js/Jw = B/(A·ν·R·T) of Phillip, Yong & Elimelech (2010,
// Environ. Sci. Technol. 44:5170). The boundary layer on the support side is
// put in series with the support (our generalisation). Loeb et al. (1997,
// J. Membr. Sci. 129:243) give the AL-FS identity used in the tests.
//
// # Units
//
// Everything is SI inside the package and every name carries its unit:
// A in m s⁻¹ Pa⁻¹ (1 LMH/bar = 1/(3.6e6·1e5) m s⁻¹ Pa⁻¹), B in m/s
// (1 LMH = 1/3.6e6 m/s), S in m, D in m²/s, k in m/s, concentrations in
// mol/m³ (= mmol/L), pressures in Pa. The conversion factors are
// engine/thermo's (units.go).
package transport

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"drawsift/engine/errs"
	"drawsift/engine/thermo"
)

// Orientation is the side the membrane's active layer faces.
type Orientation int

const (
	// ALFS: active layer facing the feed (FO mode). The support, with its
	// dilutive ICP, is on the draw side.
	ALFS Orientation = iota
	// ALDS: active layer facing the draw (PRO mode). The support, with its
	// concentrative ICP, is on the feed side.
	ALDS
)

// String returns "AL-FS" or "AL-DS".
func (o Orientation) String() string {
	switch o {
	case ALFS:
		return "AL-FS"
	case ALDS:
		return "AL-DS"
	}
	return "Orientation(" + strconv.Itoa(int(o)) + ")"
}

// ParseOrientation accepts "AL-FS", "AL-DS", "FO" (= AL-FS) and "PRO"
// (= AL-DS), case-insensitively and ignoring surrounding space.
func ParseOrientation(s string) (Orientation, error) {
	switch strings.ToUpper(strings.TrimSpace(s)) {
	case "AL-FS", "FO":
		return ALFS, nil
	case "AL-DS", "PRO":
		return ALDS, nil
	}
	return ALFS, &errs.InputError{Field: "orientation", Text: s,
		Limit: `one of "AL-FS", "AL-DS", "FO", "PRO"`, Err: ErrInvalidInput}
}

// OsmoticFunc returns the osmotic pressure π (Pa) of a solution holding only
// this solute at molar concentration c (mol/m³), and dπ/dc (Pa m³ mol⁻¹).
// Implementations must be finite, ≥ 0 and non-decreasing for all c ≥ 0,
// extending monotonically past their model's validity. Solve never passes a
// concentration above FaceCapMolPerM3.
type OsmoticFunc func(cMolPerM3 float64) (piPa, dPiDc float64)

// CompositionPi returns the osmotic pressure π (Pa) of a solution holding
// the species at concentrations c (mol/m³, in Input.Species order) and
// writes ∂π/∂c_i (Pa m³ mol⁻¹) into grad (len(grad) = len(c)). It must be
// finite, ≥ 0 and non-decreasing in every c_i for all c ≥ 0, and must not
// keep c or grad. MixingRule is the one engine/scenario uses.
type CompositionPi func(c, grad []float64) float64

// Species is one solute or ion present in either stream, by identity: the
// same solute or ion in both streams is one species with two bulk
// concentrations. By convention Input.Species[0] is a draw species;
// Result.JsMolPerM2S refers to it.
type Species struct {
	Name                               string
	DrawBulkMolPerM3, FeedBulkMolPerM3 float64
	BMPerS                             float64 // active-layer solute permeability B
	DM2PerS                            float64 // diffusion coefficient in the support and boundary layers
	// Charge z of an ion (0 for a neutral solute, or a salt transported
	// as one solute). Ions cross the active layer coupled by zero
	// electric current (ions.go); each bulk's ions must be electroneutral.
	Charge int
	// Pi is the species' own π(c), used by the additive rule when
	// Input.FacePi is nil (then required).
	Pi OsmoticFunc
	// Field names the species' inputs in errors (default: the draw
	// solute's fields for Species[0], the feed solute's for Species[1]).
	Field string
}

// Input describes one flux calculation.
type Input struct {
	AMPerSPa    float64 // water permeability A
	SM          float64 // structural parameter S
	Orientation Orientation
	// DeltaPPa is the hydraulic pressure of the draw side over the feed side.
	// Positive opposes the osmotic water flux (PRO); negative is pressure on
	// the feed side (pressure-assisted osmosis).
	DeltaPPa float64
	// Boundary-layer mass-transfer coefficients; math.Inf(1) means no
	// external CP on that side.
	KDrawMPerS, KFeedMPerS float64
	Species                []Species // 1 to MaxSpecies; Species[0] is a draw species
	// FacePi gives π at a face from its whole composition; nil means the
	// additive rule, each species' own Pi at its own concentration (exact
	// for van 't Hoff solutes, an approximation otherwise).
	FacePi CompositionPi
}

// MaxSpecies bounds Input.Species (seawater has about a dozen ions; a
// draw blend adds a few).
const MaxSpecies = 32

// SpeciesResult holds the solution for one species.
type SpeciesResult struct {
	FluxMolPerM2S    float64 // N_j, positive feed → draw
	FeedFaceMolPerM3 float64 // at the feed face of the active layer
	DrawFaceMolPerM3 float64 // at the draw face of the active layer
	// SupportInterfaceMolPerM3 is the concentration where the support meets
	// its outer boundary layer (draw side in AL-FS, feed side in AL-DS). The
	// difference from the active-layer face is the ICP share, the difference
	// from the bulk the ECP share. Equal to the bulk when that side has no
	// external CP.
	SupportInterfaceMolPerM3 float64
}

// Result is the converged state.
type Result struct {
	JwMPerS float64 // water flux, positive feed → draw; negative is reverse flow
	// JsMolPerM2S is the reverse flux of the draw solute (Species[0]),
	// positive draw → feed: −Species[0].FluxMolPerM2S.
	JsMolPerM2S float64
	Species     []SpeciesResult // same order as Input.Species
	// Potential is the electric potential drop across the active layer,
	// F·(ψ_feed face − ψ_draw face)/(R·T) (dimensionless; 0 when no ions
	// are coupled, see ions.go).
	Potential float64
	// Osmotic pressures (sum over species, additive rule) at the two faces of
	// the active layer and in the two bulks.
	PiFeedFacePa, PiDrawFacePa, PiFeedBulkPa, PiDrawBulkPa float64
	Stats                                                  Stats

	// buf is the composition π's scratch (kept with the Result so that
	// SolveInto does not allocate when the Result is reused).
	buf []float64
}

// Stats reports how the root was found.
type Stats struct {
	Iterations  int // root-finder iterations after the first evaluation
	Evaluations int // residual evaluations
	// PotentialEvaluations counts the zero-current evaluations of coupled
	// ions (over all residual evaluations; 0 when uncoupled).
	PotentialEvaluations int
	Residual             float64 // |A(π_d − π_f − ΔP) − Jw| / (A·(π_Db + π_Fb + |ΔP|))
	Method               string  // "newton-bracketed", or "trivial" when Jw = 0 exactly
}

// ErrInvalidInput is wrapped by every input error (errs.ErrInvalidInput).
var ErrInvalidInput = errs.ErrInvalidInput

// Limits enforced by Solve. Besides the physical signs, the upper bounds are
// generous (far beyond any membrane or solution) and exist so that every
// intermediate stays finite.
const (
	maxAMPerSPa   = 1e-9  // 360 LMH/bar
	maxBMPerS     = 1e-2  // 3.6e4 LMH
	maxSM         = 0.1   // 100 mm
	minDM2PerS    = 1e-14 // m²/s
	maxDM2PerS    = 1e-6  // m²/s
	minKMPerS     = 1e-9  // m/s
	maxBulkMolM3  = 1e5   // 100 mol/L
	maxAbsDeltaPa = 1e9   // 10 000 bar
	// FaceCapMolPerM3 bounds the active-layer face concentrations (1000 mol/L).
	// During bracketing the exponential factors can ask for absurd
	// concentrations; they are held at this cap, which keeps the residual
	// finite and monotone. A converged face at the cap would mean the model's
	// π stays below the driving pressure up to 1000 mol/L: a flat π(c)
	// extension, not a physical solution.
	FaceCapMolPerM3 = 1e6
)

// Solve returns the water flux, the solute fluxes and the face
// concentrations for in. It allocates only Result.Species; see SolveInto for
// an allocation-free variant.
//
// Special cases are:
//
//	no solute anywhere and ΔP = 0        Jw = 0 exactly (Method "trivial")
//	ΔP above the osmotic difference      Jw < 0 (reverse flow), not an error
//	feed π above draw π                  Jw < 0, not an error
//	B = 0                                N_j = 0 (no solute crosses)
//
// Errors are *errs.InputError for invalid input (including an OsmoticFunc that
// returns a non-finite or negative π) and *errs.ConvergenceError if the root
// finder fails, which the property tests have not seen happen. Solve never
// returns NaN or Inf.
func Solve(in *Input) (Result, error) {
	var r Result
	err := SolveInto(in, &r)
	return r, err
}

// SolveInto is Solve writing into *out, reusing out.Species when it has room
// for len(in.Species) entries. It does not allocate in that case.
func SolveInto(in *Input, out *Result) error {
	if err := validate(in); err != nil {
		return err
	}
	n := len(in.Species)
	if cap(out.Species) < n {
		out.Species = make([]SpeciesResult, n)
	}
	out.Species = out.Species[:n]
	var s solver
	if in.FacePi != nil {
		if cap(out.buf) < 2*n {
			out.buf = make([]float64, 2*MaxSpecies)
		}
		s.buf = out.buf[:2*n]
	}
	s.setup(in)
	return s.solve(out)
}

// speciesFields names species i's inputs in the contract's terms.
func speciesFields(in *Input, i int) (b, d, draw, feed, pi string) {
	if in != nil && i < len(in.Species) && in.Species[i].Field != "" {
		f := in.Species[i].Field
		return f + ".b_lmh", f + ".diffusivity_m2_per_s", f + ".draw_concentration", f + ".feed_concentration", "osmotic_model"
	}
	if i == 0 {
		return "membrane.b_lmh", "diffusivity_m2_per_s", "draw.concentration", "feed.concentration", "osmotic_model"
	}
	return "feed.b_lmh", "feed.diffusivity_m2_per_s", "draw.concentration", "feed.concentration", "feed.osmotic_model"
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// inErr builds an *errs.InputError. A non-finite offending value travels as Text
// ("NaN", "+Inf", "-Inf") so that no error carries NaN or Inf either.
func inErr(field string, v float64, limit string) error {
	if !finite(v) {
		return &errs.InputError{Field: field, Text: strconv.FormatFloat(v, 'g', -1, 64), Limit: limit, Err: ErrInvalidInput}
	}
	return &errs.InputError{Field: field, Value: v, Limit: limit, Err: ErrInvalidInput}
}

func validate(in *Input) error {
	if in == nil {
		return &errs.InputError{Field: "request", Text: "nil", Limit: "non-nil", Err: ErrInvalidInput}
	}
	if !(in.AMPerSPa > 0 && in.AMPerSPa <= maxAMPerSPa) {
		return inErr("membrane.a_lmh_per_bar", in.AMPerSPa/thermo.MPerSPaPerLMHPerBar,
			fmt.Sprintf("> 0 and ≤ %g LMH/bar", maxAMPerSPa/thermo.MPerSPaPerLMHPerBar))
	}
	if !(in.SM > 0 && in.SM <= maxSM) {
		return inErr("membrane.s_um", in.SM*1e6, fmt.Sprintf("> 0 and ≤ %g µm", maxSM*1e6))
	}
	if in.Orientation != ALFS && in.Orientation != ALDS {
		return &errs.InputError{Field: "orientation", Text: in.Orientation.String(),
			Limit: `"AL-FS" or "AL-DS"`, Err: ErrInvalidInput}
	}
	if !(math.Abs(in.DeltaPPa) <= maxAbsDeltaPa) {
		return inErr("delta_p_bar", in.DeltaPPa/thermo.PascalPerBar, fmt.Sprintf("finite with |ΔP| ≤ %g bar", maxAbsDeltaPa/thermo.PascalPerBar))
	}
	kLimit := func() string { return fmt.Sprintf("≥ %g m/s (+Inf for no external CP)", minKMPerS) }
	if !(in.KDrawMPerS >= minKMPerS) {
		return inErr("k_draw_m_per_s", in.KDrawMPerS, kLimit())
	}
	if !(in.KFeedMPerS >= minKMPerS) {
		return inErr("k_feed_m_per_s", in.KFeedMPerS, kLimit())
	}
	if n := len(in.Species); n < 1 || n > MaxSpecies {
		return inErr("species", float64(n), fmt.Sprintf("1 to %d species (solutes or ions of the draw and the feed)", MaxSpecies))
	}
	var zD, zF, aD, aF float64 // Σ z·c and Σ max(|z|, 1)·c of each bulk
	for i := range in.Species {
		sp := &in.Species[i]
		if err := validateSpecies(in, i); err != nil {
			return err
		}
		z := float64(sp.Charge)
		w := max(math.Abs(z), 1)
		zD += z * sp.DrawBulkMolPerM3
		zF += z * sp.FeedBulkMolPerM3
		aD += w * sp.DrawBulkMolPerM3
		aF += w * sp.FeedBulkMolPerM3
	}
	// The ions of each bulk must balance within 5 %, the usual acceptance
	// limit of a water analysis' ion balance (common practice): published
	// compositions balance to their rounding (seawater's Reference
	// Composition without its minor species to 6e-6, our effluent preset to
	// 0.5 %). The fluxes carry no current whatever the bulks' imbalance.
	// Neutral solutes count in the scale (weight 1): a sugar draw holding
	// traces of the feed's ions, as along a module, is not refused for
	// the traces' rounding.
	if math.Abs(zD) > 0.05*aD {
		return inErr("draw", zD/aD, "electroneutral ions (Σ z·c = 0 within 5 %; this is the relative charge excess)")
	}
	if math.Abs(zF) > 0.05*aF {
		return inErr("feed", zF/aF, "electroneutral ions (Σ z·c = 0 within 5 %; this is the relative charge excess)")
	}
	return nil
}

// validateSpecies checks species i (its field names are built only for an
// error: this runs on every solve).
func validateSpecies(in *Input, i int) error {
	sp := &in.Species[i]
	field := func(k int) string {
		fb, fd, fdraw, ffeed, fpi := speciesFields(in, i)
		return [...]string{fb, fd, fdraw, ffeed, fpi}[k]
	}
	if !(sp.BMPerS >= 0 && sp.BMPerS <= maxBMPerS) {
		return inErr(field(0), sp.BMPerS/thermo.MPerSPerLMH, fmt.Sprintf("≥ 0 and ≤ %g LMH", maxBMPerS/thermo.MPerSPerLMH))
	}
	if !(sp.DM2PerS >= minDM2PerS && sp.DM2PerS <= maxDM2PerS) {
		return inErr(field(1), sp.DM2PerS, fmt.Sprintf("≥ %g and ≤ %g m²/s", minDM2PerS, maxDM2PerS))
	}
	cLimit := func() string { return fmt.Sprintf("≥ 0 and ≤ %g mol/L", maxBulkMolM3/thermo.MolPerM3PerMolPerL) }
	if !(sp.DrawBulkMolPerM3 >= 0 && sp.DrawBulkMolPerM3 <= maxBulkMolM3) {
		return inErr(field(2), sp.DrawBulkMolPerM3/thermo.MolPerM3PerMolPerL, cLimit())
	}
	if !(sp.FeedBulkMolPerM3 >= 0 && sp.FeedBulkMolPerM3 <= maxBulkMolM3) {
		return inErr(field(3), sp.FeedBulkMolPerM3/thermo.MolPerM3PerMolPerL, cLimit())
	}
	if sp.Pi == nil && in.FacePi == nil {
		return &errs.InputError{Field: field(4), Text: "nil", Limit: "an osmotic-pressure function", Err: ErrInvalidInput}
	}
	if sp.Charge < -4 || sp.Charge > 4 {
		f := fmt.Sprintf("species[%d].charge", i)
		if sp.Field != "" {
			f = sp.Field + ".charge"
		}
		return inErr(f, float64(sp.Charge), "an ion charge from −4 to 4")
	}
	return nil
}
