package transport

// FluxEfficiency is the water flux as a fraction of the flux the bulk
// driving force would give with no concentration polarization:
//
//	η = Jw / (A · (π_D,b − π_F,b − ΔP))
//
// (the "flux efficiency" of draw-solute screening studies, e.g. Achilli,
// Cath & Childress 2010, J. Membr. Sci. 364:233). It is 0 when the bulk
// driving force is zero. aMPerSPa and deltaPPa are the problem's A and ΔP.
func (r *Result) FluxEfficiency(aMPerSPa, deltaPPa float64) float64 {
	drive := r.PiDrawBulkPa - r.PiFeedBulkPa - deltaPPa
	if drive == 0 || aMPerSPa == 0 {
		return 0
	}
	return r.JwMPerS / (aMPerSPa * drive)
}
