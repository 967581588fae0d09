package dist

import ("fmt"; "math")

func fmtG(x float64) string { return fmt.Sprintf("%.3g", x) }

var exp, erf, sqrt = math.Exp, math.Erf, math.Sqrt
