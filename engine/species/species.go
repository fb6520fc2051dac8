// Package species lays out the transport species of a draw against a feed
// by identity (issue #11): both streams are lists of ions (and neutral
// solutes), and an ion in both is one species. It gives every species its
// B, diffusivity and share of the face osmotic pressure, and sums the
// draw's net and gross losses from a solution.
package species

import (
	"fmt"
	"sync"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/transport"
)

// Species by identity (issue #11): the draw and the feed are both lists of
// ions (and neutral solutes); an ion in both is one transport species.
// Transport builds the transport problem's species for one draw solute
// and one feed, once; Fill sets what changes from solve to solve (the
// draw's concentration, the diffusivities, perturbations).

// Role of a species: in the draw bulk only, the feed bulk only, or both.
const (
	RoleDraw = "draw"
	RoleFeed = "feed"
	RoleBoth = "both"
)

// SpeciesInfo describes one transport species.
type SpeciesInfo struct {
	Name   string // ion symbol, or solute ID for a neutral solute
	Charge int
	Role   string
	// MolarMassKgPerMol of the species (an ion's share of its salt's
	// formula mass, so that the ions of a salt add up to it exactly).
	MolarMassKgPerMol float64
	// DrawPerUnit: mol of the species per mol of the draw solute's formula
	// unit; FeedMolPerM3: its bulk concentration in the feed.
	DrawPerUnit, FeedMolPerM3 float64
	BMPerS                    float64
	BOrigin                   library.BOrigin
	// Particles: ions (or solute particles) one unit of the species
	// makes: ν for a salt moved as one unit, else 1.
	Particles float64
	// neutralSide: for a neutral species, the side whose solution
	// diffusivity it takes ('d' or 'f'); ions take the support side's.
	neutralSide byte
	whole       bool // a solute moved as one unit: never shared
}

// Transport is the species layout of one draw solute against one feed.
type Transport struct {
	Info []SpeciesInfo
	// Rule is the face π (Young's rule over the draw's and the feed's
	// solutions); group 0 is the draw, group 1 the feed (if any).
	Rule              *transport.MixingRule
	drawIons, feedIon bool
	feedGroup         int
	tmpl              []transport.Species
}

// unit is one species of a solute per formula unit.
type unit struct {
	name      string
	particles float64 // ν of a solute moved whole, else 1
	charge    int
	perUnit   float64
	massKg    float64
	d0        float64
	solute    *library.Solute // the library solute it came from
	wholeUnit bool            // a neutral solute, or a solute moved as one unit
}

// unitsOf lists a solute's species per formula unit: a salt's ions, a
// blend's parts' species scaled by their mole fractions, an ion
// composition's ions, or the solute itself (no ions, or whole).
func unitsOf(s *library.Solute, whole bool) []unit {
	if whole {
		return []unit{{name: s.ID, particles: max(s.Nu(), 1), perUnit: 1, massKg: s.MolarMassGPerMol / 1000, d0: s.Diffusivity.D0M2PerS, solute: s, wholeUnit: true}}
	}
	if s.IsBlend() {
		var out []unit
		for _, c := range s.Components {
			for _, u := range unitsOf(c.Solute, false) {
				u.perUnit *= c.MoleFraction
				out = mergeUnit(out, u)
			}
		}
		return out
	}
	shares := s.IonShares()
	if len(shares) == 0 {
		return unitsOf(s, true)
	}
	out := make([]unit, 0, len(shares))
	known, sum := true, 0.0
	for _, sh := range shares {
		m := sh.MolarMassGPerMol
		if !(m > 0) {
			m, _ = library.IonMolarMass(sh.Symbol)
		}
		known = known && m > 0
		sum += sh.PerUnit * m
		d0 := sh.DiffusivityM2PerS
		if !(d0 > 0) {
			d0, _ = library.IonD0(sh.Symbol)
		}
		out = append(out, unit{name: sh.Symbol, charge: sh.Charge, perUnit: sh.PerUnit, massKg: m / 1000, d0: d0, solute: s})
	}
	// A salt's ions add up to its formula mass exactly (the table's ion
	// masses are rounded atomic weights); unknown ions split the rest by
	// their count.
	if s.Osmotic.Kind != library.ModelMixture && s.MolarMassGPerMol > 0 {
		if known && sum > 0 {
			f := s.MolarMassGPerMol / sum
			for i := range out {
				out[i].massKg *= f
			}
		} else {
			var n, rest float64
			rest = s.MolarMassGPerMol / 1000
			for _, u := range out {
				if u.massKg > 0 {
					rest -= u.perUnit * u.massKg
				} else {
					n += u.perUnit
				}
			}
			for i := range out {
				if !(out[i].massKg > 0) && n > 0 && rest > 0 {
					out[i].massKg = rest / n
				}
			}
		}
	}
	return out
}

func mergeUnit(list []unit, u unit) []unit {
	for i := range list {
		if list[i].name == u.name && list[i].charge == u.charge {
			list[i].perUnit += u.perUnit
			return list
		}
	}
	return append(list, u)
}

// TransportSide is one stream as Transport reads it.
type TransportSide struct {
	Solute *library.Solute
	// Whole moves the solute as one species (a feed whose π stands in
	// for its ions, library.EquivalentNaClRule).
	Whole bool
	// CMolPerM3 is the feed's formula-unit concentration (unused for the
	// draw, whose concentration Fill sets).
	CMolPerM3 float64
	// Nu: particles per formula unit of the solution's π function.
	Nu float64
	// BMPerS, when set, is B for every species of this side not set by
	// the other (the draw's b_lmh; the feed's b_feed_lmh), with origin
	// BUser.
	BMPerS *float64
	// Prepared, when set, is the side laid out once by PrepareSide (with
	// the same membrane and this side's BMPerS), for a side laid out
	// against many others (a screen's feed against every candidate).
	Prepared *Side
}

// Side is one stream's species per formula unit, with their masses,
// diffusivities and B, laid out once (read-only once made).
type Side struct {
	u []unit
	b []sideB
}

// sideB is one species' B and its origin, or why it has none.
type sideB struct {
	b      float64
	origin library.BOrigin
	err    error
}

// PrepareSide lays out side's species (as one species when whole) with B
// from mem and the side's override, as NewTransport would for a species
// it does not share with the other side.
func PrepareSide(mem *Permeability, side TransportSide) *Side {
	u := unitsOf(side.Solute, side.Whole)
	s := &Side{u: u, b: make([]sideB, len(u))}
	for i := range u {
		s.b[i].b, s.b[i].origin, s.b[i].err = mem.speciesB(u[i], side.BMPerS)
	}
	return s
}

// units returns the side's species (read-only): prepared, or listed once
// per solute record.
func (s *TransportSide) units() []unit {
	if s.Prepared != nil {
		return s.Prepared.u
	}
	return cachedUnits(s.Solute, s.Whole)
}

// cachedUnits is unitsOf, listed once per solute record (records are
// read-only once made; a screen lays out every candidate on every run).
func cachedUnits(s *library.Solute, whole bool) []unit {
	return unitsMemo.get(unitsKey{s, whole}, func() []unit { return unitsOf(s, whole) })
}

type unitsKey struct {
	s     *library.Solute
	whole bool
}

// unitsMemo keeps at most 1024 records' lists (custom solutes come and go
// with requests; past that a list is made each time).
var unitsMemo = memo[unitsKey, []unit]{max: 1024}

// memo is a bounded map filled on first use, safe for concurrent use: a
// plain map under a lock (in js/wasm a sync.Map's lookup costs several
// times a map's). Values must be the same whoever makes them.
type memo[K comparable, V any] struct {
	mu  sync.RWMutex
	m   map[K]V
	max int
}

// get returns the value kept for k, else build's, kept while there is room.
func (c *memo[K, V]) get(k K, build func() V) V {
	c.mu.RLock()
	v, ok := c.m[k]
	c.mu.RUnlock()
	if ok {
		return v
	}
	v = build()
	c.mu.Lock()
	if len(c.m) < c.max {
		if c.m == nil {
			c.m = map[K]V{}
		}
		c.m[k] = v
	}
	c.mu.Unlock()
	return v
}

// Permeability is a membrane's B data (m/s): the record's (NaCl, measured
// by solute and by ion), the request's by ion and by solute, and whether a
// NaCl B is known to estimate from.
type Permeability struct {
	B                   library.SoluteB
	UserIon, UserSolute map[string]float64
	Known               bool
}

// NewTransport lays out the species of draw against feed (feed.Solute nil
// for pure water) with B per species from mem: an override of the side,
// the membrane's measured value for the ion or the solute, the NaCl B for
// Na⁺ and Cl⁻, else library.HinderedRule. Draw species come first; a
// species in both streams is one species (role both) and takes the draw's
// B.
func NewTransport(mem *Permeability, draw, feed TransportSide) (*Transport, error) {
	t := &Transport{}
	// add lays out unit u of side 'd' or 'f', with B from pre when the
	// side was prepared.
	add := func(u unit, side byte, perUnit, feedC float64, over *float64, pre *sideB) error {
		for i := range t.Info {
			in := &t.Info[i]
			if in.Name == u.name && in.Charge == u.charge && !u.wholeUnit && !in.whole {
				in.DrawPerUnit += perUnit
				in.FeedMolPerM3 += feedC
				if side == 'f' && in.Role == RoleDraw {
					in.Role = RoleBoth
				}
				return nil
			}
		}
		if len(t.Info) >= transport.MaxSpecies {
			return errs.InvalidText("feed", "", fmt.Sprintf("at most %d species", transport.MaxSpecies), "the draw and the feed hold more than %d species together", transport.MaxSpecies)
		}
		info := SpeciesInfo{Name: u.name, Charge: u.charge, MolarMassKgPerMol: u.massKg, Particles: max(u.particles, 1),
			DrawPerUnit: perUnit, FeedMolPerM3: feedC, Role: RoleDraw}
		if side == 'f' {
			info.Role = RoleFeed
		}
		if u.charge == 0 {
			info.neutralSide = side
		}
		info.whole = u.wholeUnit && side == 'f' && feed.Whole
		var b float64
		var origin library.BOrigin
		var err error
		if pre != nil {
			b, origin, err = pre.b, pre.origin, pre.err
		} else {
			b, origin, err = mem.speciesB(u, over)
		}
		if err != nil {
			return err
		}
		info.BMPerS, info.BOrigin = b, origin
		t.Info = append(t.Info, info)
		return nil
	}
	drawUnits, feedUnits := draw.units(), []unit(nil)
	if feed.Solute != nil && feed.CMolPerM3 > 0 {
		feedUnits = feed.units()
	}
	t.Info = make([]SpeciesInfo, 0, min(len(drawUnits)+len(feedUnits), transport.MaxSpecies))
	for _, u := range drawUnits {
		if u.charge != 0 {
			t.drawIons = true
		}
		if err := add(u, 'd', u.perUnit, 0, draw.BMPerS, nil); err != nil {
			return nil, err
		}
	}
	for i, u := range feedUnits {
		if u.charge != 0 {
			t.feedIon = true
		}
		var pre *sideB
		if feed.Prepared != nil {
			pre = &feed.Prepared.b[i]
		}
		if err := add(u, 'f', 0, u.perUnit*feed.CMolPerM3, feed.BMPerS, pre); err != nil {
			return nil, err
		}
	}
	n := len(t.Info)
	t.Rule = transport.NewMixingRule(n)
	t.Rule.AddSolution(nil, draw.Nu)
	t.feedGroup = -1
	if feed.Solute != nil && feed.CMolPerM3 > 0 {
		t.feedGroup = t.Rule.AddSolution(nil, feed.Nu)
	}
	t.tmpl = make([]transport.Species, n)
	for i, in := range t.Info {
		t.Rule.SetParticles(i, in.Particles)
		t.tmpl[i] = transport.Species{Name: in.Name, Charge: in.Charge, FeedBulkMolPerM3: in.FeedMolPerM3, BMPerS: in.BMPerS,
			Field: fieldOf(in.Name)}
		switch in.Role {
		case RoleDraw:
			t.Rule.SetShare(0, i, 1)
		case RoleFeed:
			t.Rule.SetShare(t.feedGroup, i, 1)
		}
	}
	return t, nil
}

// speciesB returns B for one species: the side's override, then the
// request's per-ion or per-solute value, the record's, NaCl's B for Na⁺,
// Cl⁻ and NaCl, else the hindered-diffusion estimate.
func (m *Permeability) speciesB(u unit, over *float64) (float64, library.BOrigin, error) {
	if over != nil {
		return *over, library.BUser, nil
	}
	// Per ion first, then the solute's own value applied to its ions.
	if b, ok := m.UserIon[u.name]; ok && !u.wholeUnit {
		return b, library.BUser, nil
	}
	if u.solute != nil {
		if b, ok := m.UserSolute[u.solute.ID]; ok {
			return b, library.BUser, nil
		}
		if b, ok := m.B.ByIon[u.name]; ok && !u.wholeUnit {
			return b, library.BMeasured, nil
		}
		if b, ok := m.B.Measured[u.solute.ID]; ok {
			return b, library.BMeasured, nil
		}
	}
	if !m.Known {
		return 0, "", errs.InvalidText("membrane.b_nacl_lmh", "", "≥ 0", "B for %s is needed: give membrane.b_lmh, or membrane.b_nacl_lmh to estimate it from the NaCl value", u.name)
	}
	if u.wholeUnit {
		b, est := m.B.For(u.solute)
		if !est {
			if library.Key(u.solute.ID) == "nacl" {
				return b, library.BNaCl, nil
			}
			return b, library.BMeasured, nil
		}
		return b, library.BEstimated, nil
	}
	b, origin := m.B.Ion(u.name, u.d0)
	return b, origin, nil
}

// Fill writes the transport species into dst (len(t.Info) entries): the
// draw at formula-unit concentration cDraw (mol/m³), B times fB, and the
// diffusivities: every ion takes the diffusivity of the solution on the
// support's side (the draw's in AL-FS, the feed's in AL-DS; the other
// side's when that one holds no ions), so the ions of a layer share one
// D and its profiles stay electroneutral; a neutral species takes its own
// solution's. The face π's shares of a species in both streams follow the
// bulk concentrations.
func (t *Transport) Fill(dst []transport.Species, ori transport.Orientation, cDraw, dDraw, dFeed, fB float64, drawPi, feedPi transport.OsmoticFunc) {
	ionD := dDraw
	if (ori == transport.ALDS && t.feedIon) || !t.drawIons {
		ionD = dFeed
	}
	t.Rule.SetPi(0, drawPi)
	if t.feedGroup >= 0 {
		t.Rule.SetPi(t.feedGroup, feedPi)
	}
	for i := range t.Info {
		in := &t.Info[i]
		s := t.tmpl[i]
		s.DrawBulkMolPerM3 = in.DrawPerUnit * cDraw
		s.BMPerS = in.BMPerS * fB
		switch {
		case in.Charge != 0:
			s.DM2PerS = ionD
		case in.neutralSide == 'f':
			s.DM2PerS = dFeed
		default:
			s.DM2PerS = dDraw
		}
		dst[i] = s
	}
	t.SetShares(dst)
}

// SetShares sets the face-π rule's shares of every species in both
// streams from the bulk concentrations in sp (len(t.Info) entries): the
// draw's share is its bulk's part of the two. Fill calls it; a caller
// that changes the bulks (a module along its area) calls it again.
func (t *Transport) SetShares(sp []transport.Species) {
	for i := range t.Info {
		if t.Info[i].Role != RoleBoth {
			continue
		}
		d, f := sp[i].DrawBulkMolPerM3, sp[i].FeedBulkMolPerM3
		sh := d / (d + f)
		if !(sh >= 0 && sh <= 1) {
			sh = 0.5
		}
		t.Rule.SetShare(0, i, sh)
		t.Rule.SetShare(t.feedGroup, i, 1-sh)
	}
}

// Losses are the draw's exchange with the feed at a solution, per m²
// (divide by Jw for per unit of water: kg/m³ = g/L).
type Losses struct {
	// NetKgPerM2S is the mass the draw's own species lose net,
	// Σ −N_i·M_i over the species the draw holds (N_i the net flux,
	// positive into the draw): a species the feed also holds comes back
	// in part, a species the draw gains offsets one it loses; negative
	// when the draw gains. NetFormulaMolPerM2S is the same in the draw
	// solute's formula units (over its molar mass); for a single draw
	// solute it is its reverse flux.
	NetKgPerM2S, NetFormulaMolPerM2S float64
	// Gross: the same from the one-way fluxes toward the feed through the
	// active layer (what would be lost were nothing coming back).
	GrossKgPerM2S, GrossFormulaMolPerM2S float64
	// FeedGainKgPerM2S: the mass of the feed's own species (those the draw
	// does not hold) entering the draw.
	FeedGainKgPerM2S float64
}

// LossesAt sums the draw's losses at a solution of in (filled by Fill),
// for a draw solute of molar mass drawMolarMassKg.
func (t *Transport) LossesAt(in *transport.Input, r *transport.Result, drawMolarMassKg float64) Losses {
	var l Losses
	for i := range t.Info {
		info := &t.Info[i]
		n := r.Species[i].FluxMolPerM2S
		if info.DrawPerUnit > 0 {
			out, _ := transport.OneWay(in, r, i)
			l.NetKgPerM2S -= n * info.MolarMassKgPerMol
			l.GrossKgPerM2S += out * info.MolarMassKgPerMol
		} else if n > 0 {
			l.FeedGainKgPerM2S += n * info.MolarMassKgPerMol
		}
	}
	if drawMolarMassKg > 0 {
		l.NetFormulaMolPerM2S = l.NetKgPerM2S / drawMolarMassKg
		l.GrossFormulaMolPerM2S = l.GrossKgPerM2S / drawMolarMassKg
	}
	return l
}

// DrawFeedFace returns the draw solute's formula-unit concentration at
// the feed face of the active layer: the least over its species of c/ν
// (for a single solute, its concentration there). DrawDrawFace is the
// same at the draw face.
func (t *Transport) DrawFeedFace(r *transport.Result) float64 {
	return t.drawUnits(r, func(s *transport.SpeciesResult) float64 { return s.FeedFaceMolPerM3 })
}

// DrawDrawFace: see DrawFeedFace.
func (t *Transport) DrawDrawFace(r *transport.Result) float64 {
	return t.drawUnits(r, func(s *transport.SpeciesResult) float64 { return s.DrawFaceMolPerM3 })
}

func (t *Transport) drawUnits(r *transport.Result, c func(*transport.SpeciesResult) float64) float64 {
	best := -1.0
	for i := range t.Info {
		info := &t.Info[i]
		if info.DrawPerUnit > 0 {
			v := c(&r.Species[i]) / info.DrawPerUnit
			if best < 0 || v < best {
				best = v
			}
		}
	}
	return max(best, 0)
}

// Clone returns a copy whose face-π rule and species can be filled
// independently (one per goroutine).
func (t *Transport) Clone() *Transport {
	c := *t
	c.Rule = t.Rule.Clone()
	c.tmpl = append([]transport.Species(nil), t.tmpl...)
	return &c
}

// N is the number of species.
func (t *Transport) N() int { return len(t.Info) }

// fieldOf is a species' field path in errors ("species.Na+"), made once
// per name: a screen lays out every candidate against the feed on every
// run. At most 4096 names are kept (custom species come and go with
// requests); past that the path is built each time.
func fieldOf(name string) string {
	return fieldNames.get(name, func() string { return "species." + name })
}

var fieldNames = memo[string, string]{max: 4096}
