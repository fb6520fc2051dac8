package screen

import (
	"math"

	"drawsift/engine/library"
)

// Normalise maps each objective's column to [0, 1], 1 the best:
//
//	maximised: 1 − (max − v)/d     minimised: 1 − (v − min)/d
//	d = max(max − min, resolution)
//
// over the rows whose value is known; an unknown value gets 0 (the worst).
// With d = max − min this is min–max normalisation; the resolution (see
// objectiveInfo: 10 % of the column's largest magnitude for ratio-scale
// metrics, 0.1 for fractions, 0.5 for saturation indices) keeps spreads
// smaller than the estimates' accuracy from being stretched over the
// whole range, so a 2 % difference in energy does not weigh like a
// factor of two. Scores stay independent of the units the values are
// expressed in (any positive scale).
func Normalise(vals [][NumObjectives]float64, known [][NumObjectives]bool, out [][NumObjectives]float64) {
	for o := Objective(0); o < NumObjectives; o++ {
		lo, hi := math.Inf(1), math.Inf(-1)
		for i := range vals {
			if known[i][o] {
				lo = math.Min(lo, vals[i][o])
				hi = math.Max(hi, vals[i][o])
			}
		}
		info := objectives[o]
		d := math.Max(hi-lo, math.Max(info.AbsRes, info.RelRes*math.Max(math.Abs(lo), math.Abs(hi))))
		for i := range vals {
			switch {
			case !known[i][o]:
				out[i][o] = 0
			case !(d > 0):
				out[i][o] = 1
			case o.Maximise():
				out[i][o] = 1 - (hi-vals[i][o])/d
			default:
				out[i][o] = 1 - (vals[i][o]-lo)/d
			}
		}
	}
}

// Score returns Σ_o w_o·n_o / Σ w, writing each term into contrib: the
// weighted score in [0, 1] with the contribution of each objective
// visible. w must have a positive sum.
func Score(norm *[NumObjectives]float64, w *Weights, contrib *[NumObjectives]float64) float64 {
	sum := 0.0
	for _, v := range w {
		sum += v
	}
	s := 0.0
	for o := range norm {
		c := w[o] * norm[o] / sum
		contrib[o] = c
		s += c
	}
	return s
}

// ParetoFront reports, for each row of vals, whether it is non-dominated
// on the given objectives. Row a dominates row b when a is at least as
// good on every objective and strictly better on one (better = larger for
// a maximised objective, smaller for a minimised one). An unknown value
// counts as the worst possible.
func ParetoFront(vals [][NumObjectives]float64, known [][NumObjectives]bool, objs []Objective) []bool {
	n := len(vals)
	front := make([]bool, n)
	oriented := func(i int, o Objective) float64 {
		if !known[i][o] {
			return math.Inf(-1)
		}
		if o.Maximise() {
			return vals[i][o]
		}
		return -vals[i][o]
	}
	for b := 0; b < n; b++ {
		front[b] = true
		for a := 0; a < n && front[b]; a++ {
			if a == b {
				continue
			}
			geAll, gtOne := true, false
			for _, o := range objs {
				va, vb := oriented(a, o), oriented(b, o)
				if va < vb {
					geAll = false
					break
				}
				if va > vb {
					gtOne = true
				}
			}
			if geAll && gtOne {
				front[b] = false
			}
		}
	}
	return front
}

// order sorts idx by score descending, ties by name ascending (insertion
// sort: n is small and this allocates nothing).
func order(idx []int, scores []float64, names []string) {
	for i := 1; i < len(idx); i++ {
		for j := i; j > 0 && better(idx[j], idx[j-1], scores, names); j-- {
			idx[j], idx[j-1] = idx[j-1], idx[j]
		}
	}
}

func better(a, b int, scores []float64, names []string) bool {
	if scores[a] != scores[b] {
		return scores[a] > scores[b]
	}
	return names[a] < names[b]
}

// ScoreNormalisation chooses how each metric is scaled before weighting.
type ScoreNormalisation int

// Normalisations.
const (
	// NormaliseSet scales min–max over the ranked candidates (Normalise):
	// a score says how a candidate stands within this set.
	NormaliseSet ScoreNormalisation = iota
	// NormaliseReference scales against the reference draw's values
	// (NormaliseAgainst): a score does not depend on the other candidates.
	NormaliseReference
)

// ScoreNormalisationNames are the request names, in the order of the constants.
var ScoreNormalisationNames = []string{"set", "reference"}

// ReferenceSolute is the reference draw of NormaliseReference: NaCl, the
// usual benchmark draw of forward-osmosis screening (common practice; e.g.
// Achilli, Cath & Childress 2010 compare every draw with NaCl), brought to
// the same basis, membrane, feed and orientation as the candidates.
const ReferenceSolute = "NaCl"

// Reference is the reference draw's result at the scenario's basis.
type Reference struct {
	Solute  *library.Solute
	Metrics Metrics
	Values  [NumObjectives]float64
	Known   [NumObjectives]bool
}

// ReferenceFormula states NormaliseAgainst in words.
const ReferenceFormula = "q = v/r (maximised) or r/v (minimised), 10^(r−v) for the saturation index; normalised q/(1+q), so the reference scores 0.5 and twice as good 0.67"

// NormaliseAgainst maps each value v to [0, 1] against the reference's r
// (ReferenceFormula), independently of the other rows. An unknown v gives
// 0; v ≤ 0 on a ratio metric counts as worst if maximised, best if
// minimised; an unknown or non-positive r gives 0.5 (no comparison).
func NormaliseAgainst(vals [][NumObjectives]float64, known [][NumObjectives]bool, ref *Reference, out [][NumObjectives]float64) {
	for i := range vals {
		for o := Objective(0); o < NumObjectives; o++ {
			v, r, q := vals[i][o], ref.Values[o], 0.0
			switch {
			case !known[i][o]:
				out[i][o] = 0
				continue
			case !ref.Known[o] || o != ObjScaling && !(r > 0):
				q = 1
			case o == ObjScaling:
				q = math.Pow(10, r-v) // minimised, log units
			case !(v > 0):
				q = math.Inf(1)
				if o.Maximise() {
					q = 0
				}
			case o.Maximise():
				q = v / r
			default:
				q = r / v
			}
			if math.IsInf(q, 1) {
				out[i][o] = 1
			} else {
				out[i][o] = q / (1 + q)
			}
		}
	}
}

// normaliseRows applies the scenario's normalisation.
func normaliseRows(mode ScoreNormalisation, ref *Reference, vals [][NumObjectives]float64, known [][NumObjectives]bool, out [][NumObjectives]float64) {
	if mode == NormaliseReference && ref != nil {
		NormaliseAgainst(vals, known, ref, out)
		return
	}
	Normalise(vals, known, out)
}
