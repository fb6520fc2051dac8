package thermo

import (
	"math"
	"strconv"
	"sync"

	"drawsift/engine/library"
)

// Prepared returns the Solution of s at tK, shared between callers. For a
// solute of the embedded library (library.Default), and for a blend of
// library solutes (keyed by its name, parts and fractions, so one blend
// asked for again in another request is the same), it is built once per
// temperature and kept, so that a screen, a flux request or a blend part
// does not rebuild the same tables (the π table behind FastOsmoticFunc
// costs about 500 model evaluations); other solutes (custom solutes and
// blends holding them) get a new Solution every call.
//
// A Solution is immutable once built (its lazy tables are guarded by
// sync.Once), so one value serves concurrent requests. The cache holds at
// most preparedMax Solutions; past that it starts afresh. A library
// Solution with its π table takes about 11 KB (measured over the library
// at ten temperatures), so the cache stays near 11 MB at most.
func Prepared(s *library.Solute, tK float64) (*Solution, error) {
	k := preparedKey{tK2: math.Float64bits(tK)}
	switch {
	case inLibrary(s):
		k.s = s
	case blendOfLibrary(s):
		k.blend = blendKey(s)
	default:
		return NewSolution(s, tK)
	}
	return prepared.get(k, func() (*Solution, error) { return NewSolution(s, tK) })
}

// preparedMax bounds the cache: the library's solutes at a few dozen
// temperatures (a temperature sweep), our own choice.
const preparedMax = 1024

type preparedKey struct {
	s     *library.Solute // a library record
	blend string          // or a blend of records (blendKey)
	tK2   uint64
}

var prepared = newOnceCache[preparedKey, *Solution](preparedMax)

// inLibrary reports whether s is a record of the embedded library (the
// same pointer, not merely the same ID: a custom solute may reuse no
// library ID, but a request's blend is always new).
func inLibrary(s *library.Solute) bool {
	return libraryRecords()[s]
}

// blendOfLibrary reports whether s is a blend of library records only.
func blendOfLibrary(s *library.Solute) bool {
	if !s.IsBlend() {
		return false
	}
	for _, c := range s.Components {
		if !inLibrary(c.Solute) {
			return false
		}
	}
	return true
}

// blendKey names a blend by everything its Solution depends on: its ID
// and each part's ID and exact mole fraction.
func blendKey(s *library.Solute) string {
	b := []byte(s.ID)
	for _, c := range s.Components {
		b = append(b, 0)
		b = append(b, c.Solute.ID...)
		b = strconv.AppendUint(append(b, 0), math.Float64bits(c.MoleFraction), 16)
	}
	return string(b)
}

var libraryRecords = sync.OnceValue(func() map[*library.Solute]bool {
	out := map[*library.Solute]bool{}
	if lib, err := library.Default(); err == nil {
		for _, s := range lib.All() {
			out[s] = true
		}
	}
	return out
})

// SharedIonMixture is NewIonMixture shared between callers: the model of
// one ion list (in its order) at one temperature is built once and kept,
// so that every screen against the same feed does not rebuild its
// scaling model (the mixing terms of every ion pair and triplet). A
// Mixture is immutable once built (its mineral list behind sync.Once),
// so one value serves concurrent requests; callers must not change it
// (its Warnings included). At most mixturesMax models are kept; past
// that the cache starts afresh.
func SharedIonMixture(ions []MixIon, tK float64) (*Mixture, error) {
	b := strconv.AppendUint(nil, math.Float64bits(tK), 16)
	for _, ion := range ions {
		b = strconv.AppendInt(append(append(b, 0), ion.Symbol...), int64(ion.Charge), 10)
	}
	return mixtures.get(string(b), func() (*Mixture, error) { return NewIonMixture(ions, tK) })
}

// mixturesMax bounds the shared mixtures (a model over a few dozen ions
// takes some tens of kB): the feeds and candidate sets of a busy server at
// a few temperatures, our own choice.
const mixturesMax = 256

var mixtures = newOnceCache[string, *Mixture](mixturesMax)

// onceCache builds each key's value once, shared by concurrent callers
// (the others wait for the first), and keeps at most max values; past
// that it starts afresh. A build that fails is not kept.
type onceCache[K comparable, V any] struct {
	mu  sync.Mutex
	m   map[K]*onceEntry[V]
	max int
}

type onceEntry[V any] struct {
	once sync.Once
	v    V
	err  error
}

func newOnceCache[K comparable, V any](max int) *onceCache[K, V] {
	return &onceCache[K, V]{m: map[K]*onceEntry[V]{}, max: max}
}

func (c *onceCache[K, V]) get(k K, build func() (V, error)) (V, error) {
	c.mu.Lock()
	e, ok := c.m[k]
	if !ok {
		if len(c.m) >= c.max {
			c.m = map[K]*onceEntry[V]{}
		}
		e = &onceEntry[V]{}
		c.m[k] = e
	}
	c.mu.Unlock()
	e.once.Do(func() { e.v, e.err = build() })
	if e.err != nil {
		// An error (a temperature out of range) is not kept.
		c.mu.Lock()
		if c.m[k] == e {
			delete(c.m, k)
		}
		c.mu.Unlock()
	}
	return e.v, e.err
}
