package transport

import (
	"fmt"
	"strings"

	"drawsift/engine/warn"
)

// CrossingWarnings explains results that leave their usual range because
// solute moves from the feed into the draw (a feed solute, or the draw
// solute where the feed holds it at a higher concentration at the
// membrane), or because the driving force at the active layer differs in
// sign from the bulk one:
//
//   - flux efficiency above 1: solute entering the draw side raises π at
//     the draw face of the active layer above the bulk draw's, so the
//     local driving force exceeds the bulk difference, and Jw/(A·Δπ_bulk)
//     is then no efficiency;
//   - a negative specific reverse solute flux: the draw solute moves from
//     feed to draw (or water flows backwards), so the draw gains solute;
//   - reverse flow although the bulk draw's π exceeds the feed's: the
//     hydraulic pressure, or polarization and crossing solute, reverse the
//     driving force at the membrane; and forward flow although the bulk
//     feed's π (with ΔP) exceeds the draw's, for the same reason.
//
// in and res are the problem and its solution; drawID names the draw
// solute and netLoss is its net flux toward the feed (mol m⁻² s⁻¹; for
// a single draw species, res.JsMolPerM2S).
func CrossingWarnings(in *Input, res *Result, drawID string, netLoss float64) []warn.Warning {
	var w []warn.Warning
	bar := func(pa float64) float64 { return pa / 1e5 } // 1 bar = 10⁵ Pa (exact)
	// Species moving feed → draw, by name.
	crossing := make([]string, 0, len(res.Species))
	for i, s := range res.Species {
		if s.FluxMolPerM2S > 0 && i < len(in.Species) {
			crossing = append(crossing, in.Species[i].Name)
		}
	}
	who := "solute"
	if len(crossing) > 0 {
		who = strings.Join(crossing, " and ")
	}
	if eff := res.FluxEfficiency(in.AMPerSPa, in.DeltaPPa); eff > 1+1e-9 {
		why := fmt.Sprintf("%s crosses from the feed into the draw side and raises the osmotic pressure at the draw face of the active layer (%.4g bar) above the bulk draw's (%.4g bar)", who, bar(res.PiDrawFacePa), bar(res.PiDrawBulkPa))
		if len(crossing) == 0 {
			why = fmt.Sprintf("the driving force across the active layer (%.4g bar) exceeds the bulk difference (%.4g bar)", bar(res.PiDrawFacePa-res.PiFeedFacePa-in.DeltaPPa), bar(res.PiDrawBulkPa-res.PiFeedBulkPa-in.DeltaPPa))
		}
		w = append(w, warn.New(warn.FeedToDraw, "flux_efficiency", "flux_efficiency %.3g is above 1: %s, so the ratio of Jw to A·Δπ(bulk) is no efficiency here", eff, why))
	}
	if res.JwMPerS != 0 && netLoss/res.JwMPerS < 0 {
		if netLoss < 0 {
			what := drawID
			if n := in.Species[0].Name; n != "" && n != drawID {
				what = fmt.Sprintf("%s (%s)", drawID, n)
			}
			w = append(w, warn.New(warn.FeedToDraw, drawID, "specific reverse solute flux is negative: %s moves from the feed into the draw (%.4g mol/L at the feed face of the active layer against %.4g mol/L at the draw face), so the draw gains solute instead of losing it",
				what, res.Species[0].FeedFaceMolPerM3/1000, res.Species[0].DrawFaceMolPerM3/1000))
		} else {
			w = append(w, warn.New(warn.ReverseFlow, drawID, "specific reverse solute flux is negative because water flows from draw to feed while %s still moves from draw to feed", drawID))
		}
	}
	if bulk := res.PiDrawBulkPa - res.PiFeedBulkPa; res.JwMPerS < 0 && bulk > 0 {
		if in.DeltaPPa >= bulk {
			w = append(w, warn.New(warn.ReverseFlow, "delta_p_bar", "reverse flow although the bulk draw's osmotic pressure exceeds the feed's by %.4g bar: the hydraulic pressure on the draw side (%.4g bar) is larger", bar(bulk), bar(in.DeltaPPa)))
		} else {
			w = append(w, warn.New(warn.ReverseFlow, "", "reverse flow although the bulk draw's osmotic pressure exceeds the feed's by %.4g bar: concentration polarization and %s crossing the membrane leave %.4g bar at the feed face of the active layer against %.4g bar at the draw face (with ΔP %.4g bar)",
				bar(bulk), who, bar(res.PiFeedFacePa), bar(res.PiDrawFacePa), bar(in.DeltaPPa)))
		}
	}
	if drive := res.PiDrawBulkPa - res.PiFeedBulkPa - in.DeltaPPa; res.JwMPerS > 0 && drive < 0 {
		w = append(w, warn.New(warn.FeedToDraw, "flux_efficiency", "water flows from feed to draw although the bulk feed's osmotic pressure (with ΔP) exceeds the draw's by %.4g bar: %s crossing into the draw side leaves %.4g bar at the draw face of the active layer against %.4g bar at the feed face; the ratio of Jw to A·Δπ(bulk) is then no efficiency",
			bar(-drive), who, bar(res.PiDrawFacePa), bar(res.PiFeedFacePa)))
	}
	return w
}
