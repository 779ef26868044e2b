# Reference: ring of major radius R = 1 with the current spread uniformly
# around the rim of the wire's section (surface current), as the mean over
# two points of the rim of Maxwell's mutual inductance of coaxial filament
# circles (AGM elliptic integrals, floats). The log singularity is
# subtracted: <ln|p1-p2|> over the rim is ln a. Trapezoid rule in the two
# angles (offset grids) for several n.
import math, sys
sys.argv = [sys.argv[0], '8']  # torus.py reads argv; only mfil is used
import os
exec(open(os.path.join(os.path.dirname(os.path.abspath(__file__)), 'torus.py')).read().split('def ring')[0])
def rim(a, n):
    s = 0.0
    for i in range(n):
        t1 = 2*math.pi*(i+0.5)/n
        x1, z1 = a*math.cos(t1), a*math.sin(t1)
        for j in range(n):
            t2 = 2*math.pi*(j+0.5)/n
            x2, z2 = a*math.cos(t2), a*math.sin(t2)
            r1, r2 = 1+x1, 1+x2
            d2 = (x1-x2)**2 + (z1-z2)**2
            if d2 == 0:
                f = r1*(math.log(8*r1)-2)
            else:
                f = mfil(r1, r2, z1-z2) + (r1+r2)/2*0.5*math.log(d2)
            s += f
    return s/(n*n) - math.log(a)
for a in [0.05, 0.1, 0.2]:
    for n in [200, 400, 800]:
        L = rim(a, n)
        lead = math.log(8/a) - 2
        print("a/R=%g n=%d L/(mu0 R)=%.12f  ln(8R/a)-2=%.12f  diff/(a/R)^2 %.5f" % (a, n, L, lead, (L-lead)/a/a), flush=True)
