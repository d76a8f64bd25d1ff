import numpy as np, time, sys
from seatool.bands import BandAxis
from seatool import modal as md
from seatool.model import Model, Subsystem, Connection, Excitation
from seatool.solve import solve
from seatool.results import Result
from seatool.physics import structural as st, acoustic as ac, radiation as rad, coupling as cp, mobility as mob

RHO, C = 1.21, 343.0
dims = (0.9, 0.75, 0.7)
full = len(sys.argv) > 1
size = (0.9, 0.75) if full else (0.5, 0.4)
off = (0.0, 0.0) if full else ((0.9 - 0.5) / 2, (0.75 - 0.4) / 2)
D = float(st.bending_stiffness(210e9, 1e-3, 0.3)); m = 7.85
bands = BandAxis.from_range(50, 1000)
eta_p, eta_c = 0.01, 0.01
box = md.ModalBox("air", dims, RHO, C, eta_c, (md.ModalPanel("panel", "z0", size, off, D, m, eta_p),), bands)
rng = np.random.default_rng(1)
npos = 6
pts = [(rng.uniform(0.1, 0.9) * size[0], rng.uniform(0.1, 0.9) * size[1]) for _ in range(npos)]
ex = [md.PointForce(f"f{i}", "panel", p, 1.0 / np.sqrt(npos)) for i, p in enumerate(pts)]
t = time.perf_counter()
r = md.solve_modal(box, ex, 1000.0)
print("modal", time.perf_counter() - t, r.modes, r.lines, r.convergence_db)
f = bands.centre
S = size[0] * size[1]
V = dims[0]*dims[1]*dims[2]
v, s_, ell = ac.rectangular_cavity_geometry(*dims)
n_p = st.plate_bending_modal_density(f, S, D, m)
n_c = ac.cavity_modal_density(f, v, s_, ell, C)
fc = st.critical_frequency(D, m, C)
sig = rad.radiation_efficiency_band(f, size[0], size[1], fc, f_lower=bands.lower, f_upper=bands.upper, c0=C)
eta_pc = cp.clf_radiation(f, sig, m, rho0=RHO, c0=C)
P = np.full(len(bands), float(mob.plate_point_mobility(D, m).real))
model = Model(bands, (Subsystem("panel", "structure", n_p, np.full(len(f), eta_p), quantity="velocity", mass=m*S),
                      Subsystem("air", "cavity", n_c, np.full(len(f), eta_c), quantity="sound_pressure", volume=V, density=RHO, sound_speed=C)),
              (Connection("rad", "panel", "air", eta_pc),), (Excitation("F", "panel", "power", power=P),))
res = Result(model, solve(model))
lv, _, _ = res.level_array()
for i in range(len(bands)):
    print(f"{bands.nominal[i]:6g}  panel {r.level('panel')[i]:6.1f} {lv[0,i]:6.1f} d={r.level('panel')[i]-lv[0,i]:5.1f}   air {r.level('air')[i]:6.1f} {lv[1,i]:6.1f} d={r.level('air')[i]-lv[1,i]:5.1f}  Np={n_p[i]*bands.width[i]:.1f} Nc={n_c[i]*bands.width[i]:.1f}")
