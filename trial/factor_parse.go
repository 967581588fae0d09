package trial

import (
	"fmt"
	"strconv"
	"strings"
)

// ParseFactorSpec reads a factor written in one line, as the command
// line's --factor and the window's factor form take it:
//
//	KEY=LEVEL,LEVEL,...            V=V1,V2,V3
//	KEY:Factor name=LEVEL,...      V:Variety=V1,V2,V3
//
// with the levels as ParseLevels reads them. Errors are plain sentences.
func ParseFactorSpec(spec string) (Factor, error) {
	head, list, ok := strings.Cut(spec, "=")
	if !ok || strings.TrimSpace(list) == "" {
		return Factor{}, fmt.Errorf("factor %q needs its levels after '=', for example \"N=0,60,120 kg N/ha\" or \"V=V1,V2,V3\"", spec)
	}
	key, name, _ := strings.Cut(head, ":")
	f := Factor{Key: strings.TrimSpace(key), Name: strings.TrimSpace(name)}
	if err := CheckFactorKey(f.Key); err != nil {
		return Factor{}, err
	}
	ls, err := ParseLevels(f.Key, list)
	if err != nil {
		return Factor{}, err
	}
	f.Levels = ls
	return f, nil
}

// ParseLevels reads a factor's levels written in one line, separated by
// commas. A level is CODE or CODE=Level name ("V1=Amberline"). A level
// that is a number is a rate: its value is the number, its code the
// factor key followed by the number (N60) when that fits in
// MaxLevelCodeLen characters, and a unit may follow the last level,
// after a space: "0,60,120 kg N/ha". The levels are not checked for
// duplicates (ValidateFactors does that).
func ParseLevels(key, list string) ([]Level, error) {
	parts := strings.Split(list, ",")
	unit := ""
	last := strings.TrimSpace(parts[len(parts)-1])
	if num, rest, ok := strings.Cut(last, " "); ok && !strings.Contains(num, "=") {
		if _, err := ParseNumber(num, PointOnly); err == nil {
			parts[len(parts)-1] = num
			unit = strings.TrimSpace(rest)
		}
	}
	var out []Level
	for _, p := range parts {
		p = strings.TrimSpace(p)
		if p == "" {
			continue
		}
		code, lname, named := strings.Cut(p, "=")
		code = strings.TrimSpace(code)
		l := Level{Code: code, Name: strings.TrimSpace(lname)}
		if v, err := ParseNumber(code, PointOnly); err == nil {
			l.Value = &v
			l.Unit = unit
			if c := key + code; key != "" && CheckLevelCode(c) == nil {
				l.Code = c
			}
			if !named {
				l.Name = strings.TrimSpace(strconv.FormatFloat(v, 'f', -1, 64) + " " + unit)
			}
		} else if unit != "" {
			return nil, fmt.Errorf("a unit after the levels needs every level to be a number, and %q is not", code)
		}
		if err := CheckLevelCode(l.Code); err != nil {
			return nil, err
		}
		out = append(out, l)
	}
	if len(out) == 0 {
		return nil, fmt.Errorf("give the levels separated by commas, for example V1,V2,V3")
	}
	return out, nil
}

// FormatLevels writes a factor's levels in the form ParseLevels reads
// back to the same levels, for a form to show: "V1=Amberline,V2" or, for
// rates coded as ParseLevels codes them, "0,60,120 kg N/ha".
func FormatLevels(f Factor) string {
	rates := len(f.Levels) > 0
	unit := ""
	for i, l := range f.Levels {
		if l.Value == nil {
			rates = false
			break
		}
		num := strconv.FormatFloat(*l.Value, 'f', -1, 64)
		name := strings.TrimSpace(num + " " + l.Unit)
		if l.Code != f.Key+num || l.Name != name || i > 0 && l.Unit != unit {
			rates = false
			break
		}
		unit = l.Unit
	}
	parts := make([]string, len(f.Levels))
	for i, l := range f.Levels {
		switch {
		case rates:
			parts[i] = strconv.FormatFloat(*l.Value, 'f', -1, 64)
		case l.Name != "" && l.Name != l.Code:
			parts[i] = l.Code + "=" + l.Name
		default:
			parts[i] = l.Code
		}
	}
	s := strings.Join(parts, ",")
	if rates && unit != "" {
		s += " " + unit
	}
	return s
}
