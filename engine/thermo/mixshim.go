package thermo

// TEMPORARY (replaced by the minerals branch): ion-based constructor over
// library salts only.

import (
	"drawsift/engine/library"
)

type Saturation struct {
	Mineral string
	SI      float64
	LogKsp  float64
	Source  string
}

func NewIonMixture(ions []MixIon, tK float64) (*Mixture, error) {
	lib, err := library.Default()
	if err != nil {
		return nil, err
	}
	have := map[string]bool{}
	for _, ion := range ions {
		have[ion.Symbol] = true
	}
	var salts []*library.Solute
	for _, s := range lib.All() {
		if s.Osmotic.Kind == library.ModelPitzer && len(s.Ions) == 2 && have[s.Ions[0].Symbol] && have[s.Ions[1].Symbol] {
			salts = append(salts, s)
		}
	}
	base, err := NewMixture(salts, tK)
	if err != nil {
		return nil, err
	}
	mx := &Mixture{aphi: base.aphi, Warnings: base.Warnings}
	for _, ion := range ions {
		mx.ions = append(mx.ions, ion)
		mx.z = append(mx.z, float64(ion.Charge))
	}
	pos := make([]int, len(mx.ions))
	for i, ion := range mx.ions {
		if ion.Charge > 0 {
			pos[i] = len(mx.cat)
			mx.cat = append(mx.cat, i)
		} else {
			pos[i] = len(mx.an)
			mx.an = append(mx.an, i)
		}
	}
	mx.pair = make([][]binary, len(mx.cat))
	for c := range mx.pair {
		mx.pair[c] = make([]binary, len(mx.an))
	}
	for bc, c := range base.cat {
		for ba, a := range base.an {
			ci, _ := mx.Index(base.ions[c].Symbol)
			ai, _ := mx.Index(base.ions[a].Symbol)
			mx.pair[pos[ci]][pos[ai]] = base.pair[bc][ba]
		}
	}
	n := len(mx.ions)
	mx.theta = make([][]float64, n)
	mx.psi = make([][][]float64, n)
	for i := range mx.theta {
		mx.theta[i] = make([]float64, n)
		mx.psi[i] = make([][]float64, n)
		for j := range mx.psi[i] {
			mx.psi[i][j] = make([]float64, n)
		}
	}
	mx.fillMixing()
	return mx, nil
}

func (mx *Mixture) Index(sym string) (int, bool) {
	for i, ion := range mx.ions {
		if ion.Symbol == sym {
			return i, true
		}
	}
	return 0, false
}

func (mx *Mixture) IonicStrength(m []float64) float64 {
	s := 0.0
	for i, v := range m {
		s += 0.5 * v * mx.z[i] * mx.z[i]
	}
	return s
}

func (mx *Mixture) MissingMixing() []string {
	var out []string
	n := len(mx.ions)
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			if mx.z[i]*mx.z[j] <= 0 {
				continue
			}
			key := likeKey(mx.ions[i].Symbol, mx.ions[j].Symbol)
			if _, ok := mixTheta[key]; !ok {
				out = append(out, key[0]+"–"+key[1])
			}
		}
	}
	return out
}

func (mx *Mixture) SaturationIndices(m []float64) []Saturation { return nil }

func pairTableIons() []string {
	var out []string
	for k := range mixTheta {
		out = append(out, k[0], k[1])
	}
	for k := range mixPsi {
		out = append(out, k[0], k[1], k[2])
	}
	return out
}
