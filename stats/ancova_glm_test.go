package stats

import (
	"fmt"
	"testing"

	"furlong/stats/glm"
)

// TestCovariateGLMOneFactor: the analysis of covariance of factorials
// (package glm, normal equations and Cholesky) with one treatment factor
// must be the one-list analysis of covariance of FitCovariate (dense QR),
// line by line, mean by mean and pair by pair, to about 1e-9. Data: the
// fibre CRD of Montgomery (the published example of ancova_test.go, from
// memory); the barley RCBD of Immer et al. (1934; R lattice::barley,
// stats/refdata/barley-1931-rcbd.csv) with the yield of the same variety
// at the next site as a constructed covariate, complete and with three
// plots left out (unbalanced).
func TestCovariateGLMOneFactor(t *testing.T) {
	t.Parallel()
	type cs struct {
		name string
		m    Model
		x    []float64
	}
	cases := []cs{{"fiber CRD", fiberModel(), fiberX}}
	{
		m, _ := loadRef(t, "barley-1931-rcbd", "yield", "variety", "site")
		x := make([]float64, len(m.Response))
		site := m.Nuisance[0]
		for i := range x {
			for j := range x {
				if m.Treatment.Index[j] == m.Treatment.Index[i] && site.Index[j] == (site.Index[i]+1)%site.Levels {
					x[i] = m.Response[j]
				}
			}
		}
		cases = append(cases, cs{"barley RCBD", m, x})
		// Three plots left out (from both analyses alike).
		u := Model{Treatment: Factor{Name: m.Treatment.Name, Levels: m.Treatment.Levels},
			Nuisance: []Factor{{Name: site.Name, Role: site.Role, Levels: site.Levels}}}
		var ux []float64
		for i := range m.Response {
			if i == 3 || i == 17 || i == 42 {
				continue
			}
			u.Response = append(u.Response, m.Response[i])
			u.Treatment.Index = append(u.Treatment.Index, m.Treatment.Index[i])
			u.Nuisance[0].Index = append(u.Nuisance[0].Index, site.Index[i])
			ux = append(ux, x[i])
		}
		cases = append(cases, cs{"barley RCBD, 3 plots missing", u, ux})
	}
	names := func(k int, prefix string) []string {
		out := make([]string, k)
		for i := range out {
			out[i] = fmt.Sprintf("%s%d", prefix, i+1)
		}
		return out
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			m, x := tc.m, tc.x
			a, c, err := FitCovariate(m, x)
			if err != nil {
				t.Fatal(err)
			}
			k := m.Treatment.Levels
			gm := glm.Model{Response: m.Response, Covariate: x,
				Factors: []glm.Factor{{Name: "trt", Levels: names(k, "t"), Index: m.Treatment.Index}}}
			if len(m.Nuisance) == 1 {
				b := m.Nuisance[0]
				gm.Block = &glm.Factor{Name: "block", Levels: names(b.Levels, "b"), Index: b.Index}
			}
			g, err := glm.Fit(gm)
			if err != nil {
				t.Fatal(err)
			}
			const tol = 1e-9
			line := func(src string) glm.Line {
				l, ok := g.Line(src)
				if !ok {
					t.Fatalf("glm has no line %s", src)
				}
				return l
			}
			trt, _ := a.Treatment()
			lt := line("trt")
			checkRel(t, "treatment SS", lt.SS, trt.SS, tol)
			checkRel(t, "treatment F", lt.F, trt.F, tol)
			checkRel(t, "treatment p", lt.P, trt.P, 1e-8)
			if lt.DF != trt.DF {
				t.Errorf("treatment df %d, want %d", lt.DF, trt.DF)
			}
			if len(m.Nuisance) == 1 {
				bl, _ := a.Line(RoleBlock)
				checkRel(t, "block SS", line("block").SS, bl.SS, tol)
			}
			cvl, _ := a.Line(RoleCovariate)
			checkRel(t, "covariate SS", line(glm.CovariateLine).SS, cvl.SS, tol)
			checkRel(t, "covariate F", line(glm.CovariateLine).F, cvl.F, tol)
			e, _ := a.Error()
			if le := line("error"); le.DF != e.DF {
				t.Errorf("error df %d, want %d", le.DF, e.DF)
			} else {
				checkRel(t, "error SS", le.SS, e.SS, tol)
			}
			gc := g.Covariate
			checkRel(t, "slope", gc.Slope, c.Slope, tol)
			checkRel(t, "slope SE", gc.SE, c.SE, tol)
			checkRel(t, "slope p", gc.P, c.P, 1e-8)
			checkRel(t, "covariate mean", gc.Mean, c.Mean, 1e-12)
			if gc.HasHomogeneity != c.HasHomogeneity || gc.HomogeneityDF1 != c.HomogeneityDF1 || gc.HomogeneityDF2 != c.HomogeneityDF2 {
				t.Errorf("homogeneity %v %d %d, want %v %d %d", gc.HasHomogeneity, gc.HomogeneityDF1, gc.HomogeneityDF2, c.HasHomogeneity, c.HomogeneityDF1, c.HomogeneityDF2)
			}
			checkRel(t, "homogeneity F", gc.HomogeneityF, c.HomogeneityF, 1e-8)
			checkRel(t, "homogeneity p", gc.HomogeneityP, c.HomogeneityP, 1e-8)
			ot, _ := c.OnTreatment.Treatment()
			if !gc.HasOnTreatment || gc.OnTreatmentTest.DF != ot.DF {
				t.Fatalf("on treatment %+v, want df %d", gc.OnTreatmentTest, ot.DF)
			}
			checkRel(t, "covariate on treatment F", gc.OnTreatmentTest.F, ot.F, tol)
			checkRel(t, "covariate on treatment p", gc.OnTreatmentTest.P, ot.P, 1e-8)
			eff, _ := g.Effect("trt")
			unadj, _ := gc.Unadjusted.Effect("trt")
			for i := range k {
				checkRel(t, "adjusted mean", eff.Means[i].Mean, a.Means[i].Mean, tol)
				checkRel(t, "adjusted mean SE", eff.Means[i].SE, a.Means[i].SE, tol)
				checkRel(t, "unadjusted mean", unadj.Means[i].Mean, c.Unadjusted.Means[i].Mean, tol)
			}
			for _, p := range eff.Comparison.Pairs {
				checkRel(t, "pair SE", p.SE, a.PairSE(p.I, p.J), tol)
			}
		})
	}
}
