package transport

import "math"

// expNeg returns e^x for x ≤ 0, to within a couple of ulp of math.Exp.
//
// Derived from the Go standard library's math.Exp (math/exp.go, BSD-style
// licence, Copyright The Go Authors), itself from FreeBSD's
// /usr/src/lib/msun/src/e_exp.c (Copyright Sun Microsystems, Inc.; "Permission
// to use, copy, modify, and distribute this software is freely granted,
// provided that this notice is preserved"). The reduction x = k·ln 2 + r,
// |r| ≤ ln 2 / 2, with ln 2 split in two, and the Remez polynomial in r² are
// theirs. The change: 2^k is built from its bits instead of by math.Ldexp
// whenever the result is a normal number. Every exponential in the flux
// profile is a decaying factor e^{−Jw·R}; in a js/wasm build math.Exp costs
// about 50 ns, most of it in math.Ldexp (measured with go test -bench).
//
// Special cases are:
//
//	expNeg(x) = 0 for x < −745.2 (and for NaN, which the callers never pass)
//	expNeg(0) = 1
func expNeg(x float64) float64 {
	const (
		ln2Hi = 6.93147180369123816490e-01
		ln2Lo = 1.90821492927058770002e-10
		log2e = 1.44269504088896338700e+00

		p1 = 1.66666666666666657415e-01  // 0x3FC55555; 0x55555555
		p2 = -2.77777777770155933842e-03 // 0xBF66C16C; 0x16BEBD93
		p3 = 6.61375632143793436117e-05  // 0x3F11566A; 0xAF25DE2C
		p4 = -1.65339022054652515390e-06 // 0xBEBBBD41; 0xC5D26BF1
		p5 = 4.13813679705723846039e-08  // 0x3E663769; 0x72BEA4D0
	)
	if !(x > -745.2) {
		return 0
	}
	if x == 0 {
		return 1
	}
	k := int(log2e*x - 0.5) // x < 0: rounds to nearest
	if x > 0 {
		k = int(log2e*x + 0.5)
	}
	hi := x - float64(k)*ln2Hi
	lo := float64(k) * ln2Lo
	r := hi - lo
	t := r * r
	c := r - t*(p1+t*(p2+t*(p3+t*(p4+t*p5))))
	y := 1 - ((lo - (r*c)/(2-c)) - hi)
	if k >= -1022 && k <= 1023 {
		return y * math.Float64frombits(uint64(k+1023)<<52)
	}
	return math.Ldexp(y, k)
}
