# Reference: self-inductance of a ring (major radius R = 1, wire radius a)
# with uniform current density, or density ∝ 1/r (the DC distribution in a
# ring), as the mean over two points of the section of the mutual
# inductance of coaxial filament circles (Maxwell), with complete elliptic
# integrals from the arithmetic-geometric mean (own code, floats).
# The log singularity is subtracted: m + ((r1+r2)/2) ln rho is C1; the
# subtracted part is integrated in closed form (log potential of a disk,
# pi a^2 ln a - (pi/2)(a^2 - |p|^2)). Product Gauss-Legendre in the radius
# of each point and the trapezoid rule in its angle; printed for several n.
import math, sys
def gl(n, lo, hi):
    xs, ws = [], []
    # Legendre nodes by Newton's method on the three-term recurrence
    for i in range(1, n+1):
        x = math.cos(math.pi*(i-0.25)/(n+0.5))
        for _ in range(100):
            p0, p1 = 1.0, x
            for k in range(2, n+1):
                p0, p1 = p1, ((2*k-1)*x*p1-(k-1)*p0)/k
            dp = n*(x*p1-p0)/(x*x-1)
            dx = p1/dp
            x -= dx
            if abs(dx) < 1e-16: break
        w = 2/((1-x*x)*dp*dp)
        xs.append(lo+(hi-lo)*(x+1)/2); ws.append(w*(hi-lo)/2)
    return xs, ws
def mfil(r1, r2, d):
    # M/mu0 of coaxial circles
    den = (r1+r2)**2 + d*d
    kp2 = ((r1-r2)**2 + d*d)/den
    m = 1 - kp2
    a, b = 1.0, math.sqrt(kp2)
    c2sum = 0.5*m  # 2^{-1} c0^2
    p = 1.0
    for _ in range(40):
        if abs(a-b) <= 4e-16*a: break
        c = (a-b)/2
        a, b = (a+b)/2, math.sqrt(a*b)
        c2sum += p*c*c
        p *= 2
    K = math.pi/(2*a)
    E = K*(1-c2sum)
    k = math.sqrt(m)
    return math.sqrt(r1*r2)*((2/k-k)*K-(2/k)*E)
def ring(a, n, weight):
    us, uw = gl(n, 0, a)
    na = 2*n
    pts = []
    for u, w in zip(us, uw):
        for j in range(na):
            al = 2*math.pi*(j+0.5)/na
            x, z = u*math.cos(al), u*math.sin(al)
            r = 1+x
            pts.append((r, z, w*u*2*math.pi/na, x*x+z*z))
    W = [p[2]*weight(p[0]) for p in pts]
    norm = sum(W)
    # the subtracted part is added back by the callers, in closed form
    rem = 0.0
    for i, (r1, z1, a1, q1) in enumerate(pts):
        s = 0.0
        for j, (r2, z2, a2, q2) in enumerate(pts):
            d2 = (r1-r2)**2 + (z1-z2)**2
            if d2 == 0:
                s += W[j]*r1*(math.log(8*r1)-2)  # the limit of f at p2 = p1
                continue
            f = mfil(r1, r2, z1-z2) + (r1+r2)/2*0.5*math.log(d2)
            s += W[j]*f
        rem += W[i]*s
    return rem, norm, pts, W
def uniform(a, n):
    rem, norm, pts, W = ring(a, n, lambda r: 1.0)
    A = math.pi*a*a
    # -int int (r1+r2)/2 ln rho dA dA = -R A^2 (ln a - 1/4), R = 1
    sing = -A*A*(math.log(a)-0.25)
    return (rem+sing)/(A*A)
def inverse_r(a, n):
    rem, norm, pts, W = ring(a, n, lambda r: 1.0/r)
    # -int int (1/r1)(1/r2)(r1+r2)/2 ln rho dA dA = -int (1/r) Phi(p) dA
    sing = 0.0
    for (r, z, dA, q) in pts:
        phi = math.pi*a*a*math.log(a) - math.pi/2*(a*a - q)
        sing -= dA/r*phi
    return (rem+sing)/(norm*norm)
for a in [float(x) for x in sys.argv[2:]]:
    for n in [int(x) for x in sys.argv[1].split(',')]:
        L = uniform(a, n)
        wien = (1+a*a/8)*math.log(8/a) - 1.75 - 0.0083*a*a
        print("a/R=%g n=%d L/(mu0 R)=%.12f  Wien %.12f  diff %.3e  (diff/(a/R)^2 %.5f)" % (a, n, L, wien, L-wien, (L-wien)/a/a), flush=True)
        L2 = inverse_r(a, n)
        print("   1/r density: L/(mu0 R)=%.12f  diff from Wien %.3e  (/(a/R)^2 %.5f)  minus uniform %.3e" % (L2, L2-wien, (L2-wien)/a/a, L2-L), flush=True)
