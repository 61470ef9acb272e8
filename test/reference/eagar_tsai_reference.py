#!/usr/bin/python3
"""Independent reference values for the Eagar-Tsai melt pool (T. W. Eagar, N.-S. Tsai, Welding
Journal 62(12):346s-355s, 1983, Eq. 10, quasi-steady).

Works in physical units straight from the published integral (substituting t = s^2) with scipy's
adaptive quadrature (QUADPACK via scipy.integrate.quad), brentq for the isotherm and a scan plus
bounded scalar minimisation for the widest and deepest sections. It shares no code with the
TypeScript solver. Run with Debian's python3-scipy:

    /usr/bin/python3 test/reference/eagar_tsai_reference.py > test/fixtures/eagar-tsai-reference.json
"""
import json
import math
import sys

import numpy as np
import scipy
from scipy import integrate, optimize

# Each case: laser power P (W), absorptivity A, speed v (mm/s), 1/e^2 spot diameter d (um),
# conductivity k (W/m/K), density rho (kg/m^3), specific heat c (J/kg/K), T0 and T_melt (K).
CASES = [
    ("check case d = 100 um", 200, 0.35, 500, 100, 30, 7800, 700, 298, 1700),
    ("check case sigma = 50 um", 200, 0.35, 500, 200, 30, 7800, 700, 298, 1700),
    ("316L typical", 200, 0.35, 800, 80, 20, 7950, 500, 298, 1723),
    ("316L low power slow", 100, 0.35, 300, 60, 20, 7950, 500, 298, 1723),
    ("316L high power", 370, 0.35, 1300, 100, 20, 7950, 500, 298, 1723),
    ("316L fast", 400, 0.35, 3000, 60, 20, 7950, 500, 298, 1723),
    ("316L slow wide spot, preheat", 400, 0.35, 200, 200, 20, 7950, 500, 473, 1723),
    ("316L near the melting threshold", 40, 0.35, 1500, 40, 20, 7950, 500, 298, 1723),
    ("316L around the width cusp", 310, 0.35, 1400, 100, 20, 7950, 500, 298, 1723),
    ("316L large spot", 150, 0.35, 1000, 120, 20, 7950, 500, 298, 1723),
    ("Ti-6Al-4V mid-range k", 280, 0.4, 1200, 70, 17, 4420, 546, 298, 1923),
    ("Ti-6Al-4V room-temperature k", 175, 0.4, 1000, 60, 7, 4420, 546, 298, 1923),
    ("Ti-6Al-4V long fast pool", 760, 0.4, 1860, 100, 7, 4420, 546, 298, 1923),
    ("Ti-6Al-4V very fast", 400, 0.4, 2500, 150, 7, 4420, 546, 298, 1923),
    ("IN718", 285, 0.35, 960, 100, 11.4, 8190, 435, 298, 1609),
    ("IN625", 195, 0.35, 800, 70, 9.8, 8440, 410, 298, 1623),
    ("AlSi10Mg", 370, 0.2, 1300, 100, 130, 2670, 915, 308, 869),
    ("CuCrZr", 500, 0.3, 500, 80, 320, 8890, 390, 298, 1358),
    ("H13 with preheat", 250, 0.35, 600, 90, 25, 7800, 460, 473, 1727),
    ("18Ni300", 180, 0.35, 700, 50, 20, 8000, 450, 298, 1727),
    ("CoCrMo", 150, 0.35, 500, 60, 13, 8300, 450, 298, 1673),
]


class Pool:
    def __init__(self, P, A, v_mm_s, d_um, k, rho, c, T0, Tm):
        self.sigma = d_um * 1e-6 / 4.0  # 1/e^2 diameter = 4 sigma (Gaussian)
        self.alpha = k / (rho * c)
        self.v = v_mm_s * 1e-3
        self.T0, self.Tm = T0, Tm
        self.pref = A * P / (math.pi * rho * c * math.sqrt(4 * math.pi * self.alpha))
        self.s0 = self.sigma / math.sqrt(self.alpha)  # time scale sqrt(sigma^2/alpha) in s^(1/2)

    def integrand(self, w, x, y, z):
        s = w * self.s0
        s2 = s * s
        a = x + self.v * s2
        e = -(a * a + y * y) / (4 * self.alpha * s2 + 2 * self.sigma ** 2)
        if z != 0.0:
            e -= z * z / (4 * self.alpha * s2)
        return 2.0 / (2 * self.alpha * s2 + self.sigma ** 2) * math.exp(e) * self.s0

    def hint_points(self, x, y, z):
        # where the integrand peaks on a log grid in w, so quad does not step over a narrow spike
        ws = np.exp(np.linspace(-12, 12, 97))
        vals = []
        for w in ws:
            s2 = (w * self.s0) ** 2
            a = x + self.v * s2
            e = -(a * a + y * y) / (4 * self.alpha * s2 + 2 * self.sigma ** 2)
            if z != 0.0:
                e -= z * z / (4 * self.alpha * s2)
            vals.append(e - math.log(2 * self.alpha * s2 + self.sigma ** 2))
        i = int(np.argmax(vals))
        wp = ws[i]
        return sorted({1.0, wp * 0.7, wp, wp * 1.4})

    def T(self, x, y=0.0, z=0.0):
        pts = self.hint_points(x, y, z)
        top = max(pts) * 4.0
        first, _ = integrate.quad(self.integrand, 0.0, top, args=(x, y, z), points=pts,
                                  limit=400, epsabs=0.0, epsrel=1e-11)
        tail, _ = integrate.quad(self.integrand, top, np.inf, args=(x, y, z),
                                 limit=400, epsabs=0.0, epsrel=1e-11)
        return self.T0 + self.pref * (first + tail)

    def outward_root(self, f, start, direction, step):
        inner, outer = start, start + direction * step
        while f(outer) > 0:
            inner, step = outer, step * 2
            outer = start + direction * step
        return optimize.brentq(f, min(inner, outer), max(inner, outer), xtol=1e-14, rtol=1e-12)

    def solve(self):
        sg = self.sigma
        res = optimize.minimize_scalar(lambda x: -self.T(x), bounds=(-3 * sg, 0.5 * sg), method="bounded",
                                       options={"xatol": 1e-6 * sg})
        x_peak, t_peak = res.x, -res.fun
        if t_peak <= self.Tm:
            return dict(width_um=0.0, depth_um=0.0, length_um=0.0, peak_temperature_k=t_peak)
        on_axis = lambda x: self.T(x) - self.Tm
        front = self.outward_root(on_axis, x_peak, +1, sg)
        rear = self.outward_root(on_axis, x_peak, -1, sg)

        def extent(x, axis):
            g = (lambda r: self.T(x, r, 0.0) - self.Tm) if axis == "y" else (lambda r: self.T(x, 0.0, r) - self.Tm)
            if g(0.0) <= 0:
                return 0.0
            return self.outward_root(g, 0.0, +1, 0.5 * sg)

        def widest(axis):
            length = front - rear
            # scan: distances from the front growing geometrically, then refine every local maximum
            ds = [d for d in np.geomspace(min(0.02 * sg, length / 40), length, 48) if d < length]
            xs = [front] + [front - d for d in ds] + [rear]
            vals = [0.0] + [extent(x, axis) for x in xs[1:-1]] + [0.0]
            best = max(vals)
            for i in range(1, len(xs) - 1):
                if vals[i] >= vals[i - 1] and vals[i] > vals[i + 1]:
                    r = optimize.minimize_scalar(lambda x: -extent(x, axis), bounds=(xs[i + 1], xs[i - 1]),
                                                 method="bounded", options={"xatol": 1e-9 * length})
                    best = max(best, -r.fun)
            return best

        return dict(width_um=2e6 * widest("y"), depth_um=1e6 * widest("z"), length_um=1e6 * (front - rear),
                    peak_temperature_k=t_peak)


def main():
    out = []
    for name, P, A, v, d, k, rho, c, T0, Tm in CASES:
        pool = Pool(P, A, v, d, k, rho, c, T0, Tm)
        r = pool.solve()
        out.append(dict(name=name, inputs=dict(laserPowerW=P, absorptivity=A, scanSpeedMmPerS=v, spotDiameterUm=d,
                                               thermalConductivityWPerMK=k, densityKgPerM3=rho,
                                               specificHeatJPerKgK=c, ambientTemperatureK=T0,
                                               meltingTemperatureK=Tm),
                        expected={key: round(val, 6) for key, val in r.items()},
                        surface_temperature_at_origin_k=round(pool.T(0.0), 6)))
        print(name, r, file=sys.stderr)
    json.dump(dict(source="test/reference/eagar_tsai_reference.py", scipy=scipy.__version__,
                   model="Eagar & Tsai 1983, Eq. 10; sigma = d/4", cases=out), sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
