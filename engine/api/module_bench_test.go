package api

import (
	"context"
	"testing"
)

// BenchmarkModuleSeawaterDesign: the module operation designing a
// counter-current module for 30 % recovery of seawater (the preset's 12
// ions, each a species) with a 1 mol/L draw, as the system screen does
// for each candidate.
func BenchmarkModuleSeawaterDesign(b *testing.B) {
	for _, solute := range []string{"NaCl", "MgCl2"} {
		b.Run(solute, func(b *testing.B) {
			body := []byte(`{"membrane": {"preset": "tfc-standard"}, "orientation": "AL-FS", "draw": {"solute": "` + solute + `", "concentration": 1, "unit": "mol/L", "flow_l_per_h": 4000}, "feed": {"preset": "seawater", "flow_l_per_h": 4000}, "target": {"recovery": 0.3}, "profile_points": 2}`)
			for b.Loop() {
				if _, e := Dispatch(context.Background(), OpModule, body); e != nil {
					b.Fatal(e)
				}
			}
		})
	}
}
