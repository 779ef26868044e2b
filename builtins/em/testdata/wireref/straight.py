# Reference: mean of F(rho) = int_0^l int_0^l dz dz' / sqrt(rho^2 + (z-z')^2)
# over pairs of points of a disk (uniform current) or of its rim (surface
# current), by mpmath tanh-sinh quadrature of the area (or rim) integrals
# in polar coordinates. a = 1.
import mpmath as mp, sys, time
mp.mp.dps = 15
def F(rho, l):
    if rho == 0: return mp.mpf(0)  # a null set; the singularity is integrable
    return 2*(l*mp.asinh(l/rho) - mp.sqrt(l*l+rho*rho) + rho)
def disk(l):
    # (1/(pi a^2)^2) * 2pi * int r1 dr1 int r2 dr2 int_0^{2pi} dth F(dist)
    def inner(r1):
        def g(r2):
            h = lambda th: F(mp.sqrt((r1-r2)**2 + 4*r1*r2*mp.sin(th/2)**2), l)
            return r2*2*mp.quad(h, [0, mp.pi/8, mp.pi], maxdegree=5)
        return r1*mp.quad(g, [0, r1, 1], maxdegree=5)
    return 2*mp.pi*mp.quad(inner, [0, 1], maxdegree=5)/mp.pi**2
def rim(l):
    # two points on the circle, angle difference th uniform
    h = lambda th: F(2*mp.sin(th/2), l)
    return mp.quad(h, [0, mp.pi])/mp.pi
for l in [float(x) for x in sys.argv[1:]]:
    t = time.time()
    r = rim(l)
    d = disk(l)
    print("l/a=%g  <F>_disk=%s  <F>_rim=%s  (%.0fs)" % (l, mp.nstr(d, 17), mp.nstr(r, 17), time.time()-t), flush=True)
