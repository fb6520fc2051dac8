package screen

import "drawsift/engine/internal/roots"

// fluxBasisMaxIterations bounds the transport solves of one flux-basis
// search (molalityForFlux) beyond the two at the bracket's ends. Brent's
// method needs about 6–10 on the library; tests lower the limit to see a
// search that does not converge reported as such.
var fluxBasisMaxIterations = roots.DefaultMaxIterations
