package pdf

import "fmt"

// code128Patterns are the bar and space widths, in modules, of the Code 128
// symbol values 0–106 (ISO/IEC 15417:2007, table 1): three bars and three
// spaces of 11 modules; 103–105 are the start codes A, B and C, and 106 the
// stop pattern with its final bar (13 modules).
var code128Patterns = [107]string{
	"212222", "222122", "222221", "121223", "121322", "131222", "122213", "122312", "132212", "221213",
	"221312", "231212", "112232", "122132", "122231", "113222", "123122", "123221", "223211", "221132",
	"221231", "213212", "223112", "312131", "311222", "321122", "321221", "312212", "322112", "322211",
	"212123", "212321", "232121", "111323", "131123", "131321", "112313", "132113", "132311", "211313",
	"231113", "231311", "112133", "112331", "132131", "113123", "113321", "133121", "313121", "211331",
	"231131", "213113", "213311", "213131", "311123", "311321", "331121", "312113", "312311", "332111",
	"314111", "221411", "431111", "111224", "111422", "121124", "121421", "141122", "141221", "112214",
	"112412", "122114", "122411", "142112", "142211", "241211", "221114", "413111", "241112", "134111",
	"111242", "121142", "121241", "114212", "124112", "124211", "411212", "421112", "421211", "212141",
	"214121", "412121", "111143", "111341", "131141", "114113", "114311", "411113", "411311", "113141",
	"114131", "311141", "411131", "211412", "211214", "211232", "2331112",
}

const code128StartB = 104

// code128 encodes s (printable ASCII, code set B) as Code 128 and returns
// the widths of its alternating bars and spaces, starting with a bar, in
// modules: start B, the characters, the modulo-103 check character and
// the stop pattern. The quiet zones are the caller's.
func code128(s string) ([]int, error) {
	if s == "" {
		return nil, fmt.Errorf("a barcode needs at least one character")
	}
	values := []int{code128StartB}
	sum := code128StartB
	for i, c := range []byte(s) {
		if c < 32 || c > 126 {
			return nil, fmt.Errorf("%q cannot be written as a Code 128 barcode (only printable ASCII)", s)
		}
		v := int(c) - 32
		values = append(values, v)
		sum += (i + 1) * v
	}
	values = append(values, sum%103, 106)
	var widths []int
	for _, v := range values {
		for _, r := range code128Patterns[v] {
			widths = append(widths, int(r-'0'))
		}
	}
	return widths, nil
}
