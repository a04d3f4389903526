#!/usr/bin/python3
"""Reference for the discharge_300W_4S2P_2RC bench cases: the same pack (the demo LiPo cell of
models/packs/demo-4s1p-lipo-5000.json, made 4S2P) at constant 300 W to its cutoff, solved with
SciPy's solve_ivp RK45 at rtol 1e-10, with and without the cell's thermal block.

Equations as src/battery/thevenin.hpp states them (piecewise-linear tables held flat beyond
their ends); the cutoff is a terminal event on the loaded cell voltage.
Prints one line per case: <name> <median-microseconds> us t_cutoff=<s>.
Needs Debian's python3-scipy (run with /usr/bin/python3 if another python is first on PATH)."""
import json, os, sys, time
import numpy as np
from scipy.integrate import solve_ivp

root = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..")
pack_path = os.path.join(root, "models", "packs", "demo-4s1p-lipo-5000.json")
pack = json.load(open(pack_path))
cell = json.load(open(os.path.join(os.path.dirname(pack_path), pack["cell"])))
S, P = pack["series"], 2
wiring = pack["wiring_ohm"]
T0 = pack["temperature_C"]
sp = S / P

def table(xs, ys):
    xs, ys = np.asarray(xs, float), np.asarray(ys, float)
    return lambda x: float(np.interp(x, xs, ys))

ocv = table(cell["ocv"]["soc"], cell["ocv"]["V"])
r0c = table(cell["r0_ohm"]["soc"], cell["r0_ohm"]["ohm"])
rf = table(cell["temperature"]["C"], cell["temperature"]["r_factor"])
rf0 = rf(T0)
cap_factor = table(cell["temperature"]["C"], cell["temperature"]["capacity_factor"])(T0)
cap_C = 3600.0 * cell["capacity_Ah"] * P * pack["soh"]["capacity"] * cap_factor
rc = cell["rc"]
m_c = cell["mass_kg"] * cell["thermal"]["c_J_per_kgK"]
hA = cell["thermal"]["hA_W_per_K"]
v_cut = cell["v_cutoff_V"]
power = 300.0

def make(thermal):
    def parts(x):
        soc, v1, v2, q, e, T = x
        rs = rf(T) / rf0 if thermal else 1.0
        r0 = sp * r0c(soc) * rf0 * rs + wiring
        emf = S * ocv(soc) - v1 - v2
        disc = emf * emf - 4.0 * r0 * power
        i = 2.0 * power / (emf + np.sqrt(max(disc, 0.0)))
        return soc, v1, v2, T, rs, r0, emf, i
    def f(t, x):
        soc, v1, v2, T, rs, r0, emf, i = parts(x)
        vt = emf - r0 * i
        r1 = sp * rc[0]["r_ohm"] * rf0 * rs
        r2 = sp * rc[1]["r_ohm"] * rf0 * rs
        heat = i * i * (r0 - wiring) + v1 * v1 / r1 + v2 * v2 / r2
        dT = (heat / (S * P) - hA * (T - T0)) / m_c if thermal else 0.0
        return [-i / cap_C, (-v1 + i * r1) / rc[0]["tau_s"], (-v2 + i * r2) / rc[1]["tau_s"], i, vt * i, dT]
    def cutoff(t, x):
        soc, v1, v2, T, rs, r0, emf, i = parts(x)
        return (emf - r0 * i) / S - v_cut
    cutoff.terminal = True
    cutoff.direction = -1
    return f, cutoff

for name, thermal in (("discharge_300W_4S2P_2RC", True), ("discharge_300W_4S2P_2RC_isothermal", False)):
    f, ev = make(thermal)
    times, t_end = [], None
    for _ in range(int(sys.argv[1]) if len(sys.argv) > 1 else 5):
        t0 = time.perf_counter()
        sol = solve_ivp(f, (0.0, 1e5), [pack["soc0"], 0, 0, 0, 0, T0], method="RK45",
                        rtol=1e-10, atol=1e-10, events=ev)
        times.append(time.perf_counter() - t0)
        t_end = sol.t_events[0][0]
    print(f"{name} {1e6 * sorted(times)[len(times) // 2]:.1f} us t_cutoff={t_end:.6f}")
