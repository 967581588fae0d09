# Tukey p-values P(Q > |diff|/SE·√2) of the studentised range by 30-digit
# quadrature with mpmath 1.3.0, for some fixture pairs with small p:
#   P(Q > q) = ∫_0^∞ f_S(s) P(R > q s) ds,  S = χ_ν/√ν,
#   P(R > r) = k ∫ φ(z) [Φ(z)^(k−1) − (Φ(z) − Φ(z−r))^(k−1)] dz.
# Usage: python3 srange_mpmath.py FIXTURE:CONTRAST ... > srange-mpmath.json
# (run in testdata/; k and ν are taken from the fixture).
import json, sys, mpmath as mp
mp.mp.dps = 30
out = []
for arg in sys.argv[1:]:
    name, contrast = arg.split(':')
    d = json.load(open(name + '.expected.json'))
    k, nu = len(d['means']), d['df_error']
    def rtail(r):
        f = lambda z: mp.npdf(z) * (mp.ncdf(z)**(k-1) - (mp.ncdf(z)-mp.ncdf(z-r))**(k-1))
        return k*mp.quad(f, [-mp.inf, -3, 0, r/2, r, r+3, mp.inf])
    lc = mp.log(2)*(1-mp.mpf(nu)/2) + (mp.mpf(nu)/2)*mp.log(nu) - mp.loggamma(mp.mpf(nu)/2)
    fs = lambda s: mp.exp(lc + (nu-1)*mp.log(s) - nu*s*s/2)
    p = [x for x in d['pairs'] if x['contrast'] == contrast][0]
    q = abs(mp.mpf(p['diff']))/mp.mpf(p['se'])*mp.sqrt(2)
    val = mp.quad(lambda s: fs(s)*rtail(q*s), [0, 0.3, 0.5, 0.7, 0.85, 1, 1.2, 1.5, 3, mp.inf])
    out.append({'fixture': name, 'contrast': contrast, 'q': float(q), 'p': mp.nstr(val, 20)})
    print(json.dumps(out[-1]), file=sys.stderr, flush=True)
json.dump(out, sys.stdout, indent=1)
