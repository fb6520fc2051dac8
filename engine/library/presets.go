package library

import (
	"bytes"
	"fmt"
	"sync"

	"drawsift/data"
	"drawsift/engine/internal/jsonx"
)

// record is what a preset file holds: records with an ID that validate
// themselves.
type record interface {
	Membrane | Feed
}

// presetFile is one embedded preset file (membranes.json, feeds.json),
// decoded strictly, validated and indexed once, on first use.
type presetFile[T record] struct {
	name     string // file in data/ and the top-level key of its records
	id       func(*T) string
	validate func(*T) error

	once sync.Once
	list []*T
	byID map[string]*T
	err  error
}

func (p *presetFile[T]) load() {
	p.once.Do(func() {
		b, err := data.FS.ReadFile(p.name + ".json")
		if err != nil {
			p.err = err
			return
		}
		var f map[string]jsonx.RawMessage
		if err := jsonx.Unmarshal(b, &f); err != nil {
			p.err = fmt.Errorf("%s: %w", p.name, err)
			return
		}
		for k := range f {
			if k != "schema_version" && k != p.name {
				p.err = fmt.Errorf("%s: unknown field %q", p.name, k)
				return
			}
		}
		dec := jsonx.NewDecoder(bytes.NewReader(f[p.name]))
		dec.DisallowUnknownFields()
		var recs []T
		if err := dec.Decode(&recs); err != nil {
			p.err = fmt.Errorf("%s: %w", p.name, err)
			return
		}
		p.byID = map[string]*T{}
		for i := range recs {
			r := &recs[i]
			if err := p.validate(r); err != nil {
				p.err = err
				return
			}
			k := Key(p.id(r))
			if _, dup := p.byID[k]; dup {
				p.err = fmt.Errorf("%s: duplicate id %q", p.name, p.id(r))
				return
			}
			p.byID[k] = r
			p.list = append(p.list, r)
		}
	})
}

// all returns the records in file order.
func (p *presetFile[T]) all() ([]*T, error) {
	p.load()
	return p.list, p.err
}

// lookup finds a record by ID, case-insensitively.
func (p *presetFile[T]) lookup(id string) (*T, bool) {
	p.load()
	r, ok := p.byID[Key(id)]
	return r, ok
}
