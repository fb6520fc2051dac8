package transport

// MixingRule gives π at a face that holds the species of several
// solutions (the draw's and the feed's) by Young's rule at equal total
// osmolarity: each solution contributes its own osmotic pressure per
// particle at the face's total particle concentration, weighted by its
// share of the particles,
//
//	π = Σ_g Q_g · h_g(C),   h_g(C) = Π_g(C/ν_g)/C,
//	C = Σ_i n_i·c_i,   Q_g = Σ_i σ_gi·n_i·c_i,
//
// where Π_g is solution g's own π as a function of its formula-unit
// concentration, ν_g its particles per formula unit, n_i the particles of
// species i (1 for an ion or a neutral solute; a salt moved as one unit
// counts its ions) and σ_gi the share of species i that belongs to g
// (Σ_g σ_gi = 1). This is the linear mixing
// rule for the osmotic coefficient, φ = Σ_g y_g·φ_g(C) (Young & Smith
// 1954, J. Phys. Chem. 58:716, for apparent molar properties; for osmotic
// coefficients it agrees with the Zdanovskii–Stokes–Robinson rule to
// first order in the difference of the solutions' φ). A face holding one
// solution's species in that solution's proportions gets exactly that
// solution's π; it is exact in the van 't Hoff limit.
type MixingRule struct {
	n      int
	groups []mixGroup
	share  []float64   // share[g*n+i] = σ_gi
	nu     []float64   // n_i, particles per species unit
	two    [2]mixGroup // room for the usual two solutions (groups)
}

type mixGroup struct {
	pi OsmoticFunc
	nu float64
}

// NewMixingRule returns a rule over n species with no solutions yet.
// Every species counts as one particle until SetParticles.
func NewMixingRule(n int) *MixingRule {
	// Two allocations (a screen makes a rule per candidate): the rule,
	// with room for the usual two solutions (the draw and the feed), and
	// one array for nu and those two solutions' shares.
	buf := make([]float64, 3*n)
	m := &MixingRule{n: n, nu: buf[:n:n], share: buf[n : n : 3*n]}
	m.groups = m.two[:0]
	for i := range m.nu {
		m.nu[i] = 1
	}
	return m
}

// SetParticles sets n_i, the particles one unit of species i makes.
func (m *MixingRule) SetParticles(i int, n float64) { m.nu[i] = n }

// AddSolution adds solution g with osmotic function pi (of its formula-unit
// concentration, mol/m³) and ν particles per formula unit, and returns g.
// Its species shares start at 0.
func (m *MixingRule) AddSolution(pi OsmoticFunc, nu float64) int {
	m.groups = append(m.groups, mixGroup{pi: pi, nu: nu})
	m.share = append(m.share, make([]float64, m.n)...)
	return len(m.groups) - 1
}

// SetPi replaces solution g's osmotic function.
func (m *MixingRule) SetPi(g int, pi OsmoticFunc) { m.groups[g].pi = pi }

// SetShare sets σ_gi, the share of species i that belongs to solution g.
func (m *MixingRule) SetShare(g, i int, s float64) { m.share[g*m.n+i] = s }

// Pi is the rule as a CompositionPi. It does not allocate.
func (m *MixingRule) Pi(c, grad []float64) float64 {
	n := m.n
	var total float64
	for i := 0; i < n; i++ {
		total += m.nu[i] * c[i]
		grad[i] = 0
	}
	var pi float64
	for g := range m.groups {
		gr := &m.groups[g]
		sh := m.share[g*n : (g+1)*n]
		var q float64
		for i := 0; i < n; i++ {
			q += sh[i] * m.nu[i] * c[i]
		}
		var h, dh float64
		if total > 0 {
			p, dp := gr.pi(total / gr.nu)
			h = p / total
			dh = (dp/gr.nu - h) / total
		} else {
			_, dp := gr.pi(0)
			h = dp / gr.nu
		}
		pi += q * h
		for i := 0; i < n; i++ {
			grad[i] += m.nu[i] * (sh[i]*h + q*dh)
		}
	}
	return pi
}

// Clone returns an independent copy.
func (m *MixingRule) Clone() *MixingRule {
	return &MixingRule{n: m.n, groups: append([]mixGroup(nil), m.groups...), share: append([]float64(nil), m.share...), nu: m.nu}
}
