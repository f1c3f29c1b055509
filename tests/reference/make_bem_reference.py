# SPDX-License-Identifier: GPL-2.0-or-later
"""Make the zero-speed panel-method (BEM) reference RAO tables for the strip-theory tests.

Test-only tool, never a runtime dependency. Run it in a separate virtual environment:

    python3 -m venv /tmp/capy-venv && /tmp/capy-venv/bin/pip install capytaine
    /tmp/capy-venv/bin/python tests/reference/make_bem_reference.py

It writes, for each of three test hulls of our own (box barge, Wigley hull, a fuller ship-like
hull with Cb ~ 0.71), into ``tests/reference/bem/``:

* ``<hull>_sections.csv``: the hull's own sections (columns x_m, beam_m, draught_m, area_m2;
  x positive forward from midship), computed analytically from the same lines that were meshed;
* ``<hull>_rao.csv``: capytaine's linear potential-flow RAOs at zero speed, rigid body about the
  centre of gravity, per unit wave amplitude, with a stated added linear roll damping.

Conventions of the tables (also written into each file's header):

* Axes: x forward from midship, y to port, z up, origin at midship in the calm waterline
  (capytaine's right-handed axes). Motions at the centre of gravity G: heave, sway [m/m];
  roll (positive port up / starboard down, right hand about +x), pitch (bow down), yaw (bow to
  port) [rad/m].
* Heading ``mu_deg`` on the seakeeping scale: 180 head, 90 beam with waves from port, 0 following,
  measured clockwise; capytaine's wave_direction (anticlockwise, propagation) is beta = -mu.
* Complex amplitudes are converted to the exp(+i omega t) time convention (capytaine uses
  exp(-i omega t); we store the complex conjugate), phase relative to the incident wave crest at
  the origin.
* Mass = displaced mass of the mesh, G above the centre of buoyancy as set by the stated GM,
  radii of gyration about G: roll 0.35 B, pitch and yaw 0.25 L (common practice, no source).
* Added linear roll damping B44_add = 0.10 * 2 sqrt(C44 (I44 + A44(omega_n))) with A44 at the
  BEM undamped roll natural frequency (damping ratio 0.10 of critical, on top of the wave
  damping); the value is written in the header so the strip engine can use the same number.
"""
from __future__ import annotations

import sys
import time
from pathlib import Path

import numpy as np

import capytaine as cpt
import xarray as xr

OUT = Path(__file__).resolve().parent / "bem"
RHO = 1025.0
G = 9.81
OMEGAS = np.round(np.concatenate([np.arange(0.30, 1.201, 0.04), np.arange(1.28, 2.001, 0.08)]), 4)
HEADINGS_DEG = np.array([180.0, 150.0, 120.0, 90.0, 45.0])
ROLL_ZETA_ADD = 0.10

HULLS = {
    # name: length, beam, draught, waterline exponent p, section exponent q, GM_T [m]
    # y(x, z) = B/2 * (1 - |2x/L|^p) * (1 - |z/T|^q); p = q = None is the box.
    "box": dict(length=60.0, beam=12.0, draught=3.0, p=None, q=None, gm=1.5),
    "wigley": dict(length=100.0, beam=10.0, draught=6.25, p=2, q=2, gm=0.5),
    "fuller": dict(length=100.0, beam=16.0, draught=6.0, p=4, q=8, gm=1.2),
}
MESH = {"box": (40, 6, 4), "wigley": (50, 0, 12), "fuller": (50, 0, 12)}


def half_breadth(hull: dict, x: np.ndarray, z: np.ndarray) -> np.ndarray:
    """Half breadth y(x, z) >= 0 of the analytic lines (z <= 0)."""
    if hull["p"] is None:
        return np.full(np.broadcast(x, z).shape, hull["beam"] / 2)
    xi = np.abs(2.0 * x / hull["length"])
    zeta = np.abs(z / hull["draught"])
    return hull["beam"] / 2 * (1 - xi ** hull["p"]) * (1 - zeta ** hull["q"])


def quads(grid: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Vertices and quadrilateral faces of a structured (n, m, 3) grid of points."""
    n, m, _ = grid.shape
    idx = np.arange(n * m).reshape(n, m)
    faces = np.stack([idx[:-1, :-1], idx[1:, :-1], idx[1:, 1:], idx[:-1, 1:]], axis=-1)
    return grid.reshape(-1, 3), faces.reshape(-1, 4)


def half_mesh(name: str) -> cpt.Mesh:
    """Port half (y >= 0) of the wetted hull, normals out of the body."""
    hull = HULLS[name]
    nx, ny, nz = MESH[name]
    L, B, T = hull["length"], hull["beam"], hull["draught"]
    x = np.linspace(-L / 2, L / 2, nx + 1)
    parts = []
    if hull["p"] is None:
        y = np.linspace(0.0, B / 2, ny + 1)
        z = np.linspace(-T, 0.0, nz + 1)
        X, Y = np.meshgrid(x, y, indexing="ij")
        parts.append(quads(np.stack([X, Y, np.full_like(X, -T)], -1)))          # bottom
        X, Z = np.meshgrid(x, z, indexing="ij")
        parts.append(quads(np.stack([X, np.full_like(X, B / 2), Z], -1)))      # side
        for xe in (-L / 2, L / 2):                                              # ends
            Y, Z = np.meshgrid(y, z, indexing="ij")
            parts.append(quads(np.stack([np.full_like(Y, xe), Y, Z], -1)))
    else:
        # girth-uniform rows at midship: cluster rows towards the keel where the hull turns
        zz = np.linspace(-T, 0.0, 2001)
        yy = half_breadth(hull, np.zeros_like(zz), zz)
        s = np.concatenate([[0.0], np.cumsum(np.hypot(np.diff(zz), np.diff(yy)))])
        z = np.interp(np.linspace(0.0, s[-1], nz + 1), s, zz)
        X, Z = np.meshgrid(x, z, indexing="ij")
        parts.append(quads(np.stack([X, half_breadth(hull, X, Z), Z], -1)))
    meshes = [cpt.Mesh(vertices=v, faces=f) for v, f in parts]
    mesh = meshes[0]
    for other in meshes[1:]:
        mesh = mesh.join_meshes(other)
    return mesh.merged()


def outward(half: cpt.Mesh) -> cpt.Mesh:
    """Flip all faces if the mirrored hull encloses a negative volume (normals inwards)."""
    full = cpt.FloatingBody(mesh=cpt.ReflectionSymmetricMesh(half=half, plane="xOz"))
    if full.disp_volume < 0:
        return cpt.Mesh(vertices=half.vertices, faces=half.faces[:, ::-1])
    return half


def fix_box_normals(mesh: cpt.Mesh, hull: dict) -> cpt.Mesh:
    """Flip box faces one by one so that each normal points away from the box centre."""
    centers, normals = mesh.faces_centers, mesh.faces_normals
    ref = np.array([0.0, 0.0, -hull["draught"] / 2])
    flip = np.sum((centers - ref) * normals, axis=1) < 0
    faces = mesh.faces.copy()
    faces[flip] = faces[flip][:, ::-1]
    return cpt.Mesh(vertices=mesh.vertices, faces=faces)


def sections_table(name: str, n: int = 41) -> np.ndarray:
    """Analytic sections of the same lines: x, beam, draught, area (rows sorted by x)."""
    hull = HULLS[name]
    L, B, T = hull["length"], hull["beam"], hull["draught"]
    x = np.linspace(-L / 2, L / 2, n)
    z = np.linspace(-T, 0.0, 4001)
    y = half_breadth(hull, x[:, None], z[None, :])
    area = 2 * np.sum(0.5 * (y[:, 1:] + y[:, :-1]) * np.diff(z), axis=1)
    beam = 2 * y[:, -1]
    draught = np.where(beam > 0, T, 0.0)
    return np.column_stack([x, beam, draught, area])


def run_hull(name: str) -> None:
    hull = HULLS[name]
    L, B, T = hull["length"], hull["beam"], hull["draught"]
    half = half_mesh(name)
    half = fix_box_normals(half, hull) if hull["p"] is None else outward(half)
    mesh = cpt.ReflectionSymmetricMesh(half=half, plane="xOz")
    lid = cpt.ReflectionSymmetricMesh(half=half.generate_lid(z=0.0), plane="xOz")
    body0 = cpt.FloatingBody(mesh=mesh, lid_mesh=lid, name=name)
    volume = float(body0.disp_volume)
    zb = float(body0.center_of_buoyancy[2])
    xb = float(body0.center_of_buoyancy[0])
    bm = float(body0.transversal_metacentric_radius)
    zg = zb + bm - hull["gm"]
    cog = np.array([xb, 0.0, zg])
    mass = RHO * volume
    body = cpt.FloatingBody(mesh=mesh, lid_mesh=lid, dofs=cpt.rigid_body_dofs(rotation_center=cog),
                            center_of_mass=cog, mass=mass, name=name)
    kxx, kyy, kzz = 0.35 * B, 0.25 * L, 0.25 * L
    dofs = ["Surge", "Sway", "Heave", "Roll", "Pitch", "Yaw"]
    inertia = np.diag([mass, mass, mass, mass * kxx ** 2, mass * kyy ** 2, mass * kzz ** 2])
    body.inertia_matrix = xr.DataArray(inertia, dims=["influenced_dof", "radiating_dof"],
                                       coords={"influenced_dof": dofs, "radiating_dof": dofs})
    body.hydrostatic_stiffness = body.compute_hydrostatic_stiffness(rho=RHO, g=G)
    betas = np.deg2rad((-HEADINGS_DEG) % 360.0)
    test = xr.Dataset(coords={"omega": OMEGAS, "wave_direction": betas,
                              "radiating_dof": dofs, "water_depth": [np.inf],
                              "rho": [RHO], "g": [G]})
    t0 = time.perf_counter()
    solver = cpt.BEMSolver()
    ds = solver.fill_dataset(test, body, n_jobs=1, progress_bar=False)
    elapsed = time.perf_counter() - t0
    c44 = float(body.hydrostatic_stiffness.sel(influenced_dof="Roll", radiating_dof="Roll"))
    a44 = ds.added_mass.sel(influenced_dof="Roll", radiating_dof="Roll").values.ravel()
    i44 = inertia[3, 3]
    w = OMEGAS
    resid = w ** 2 * (i44 + a44) - c44
    j = int(np.argmax(np.sign(resid[:-1]) != np.sign(resid[1:])))
    wn = w[j] - resid[j] * (w[j + 1] - w[j]) / (resid[j + 1] - resid[j])
    a44n = float(np.interp(wn, w, a44))
    b44_add = ROLL_ZETA_ADD * 2.0 * np.sqrt(c44 * (i44 + a44n))
    diss = xr.zeros_like(body.inertia_matrix)
    diss.loc[dict(influenced_dof="Roll", radiating_dof="Roll")] = b44_add
    rao = cpt.post_pro.rao(ds, dissipation=diss)
    write_tables(name, hull, body, ds, rao, dict(
        volume=volume, xb=xb, zb=zb, bm=bm, zg=zg, mass=mass, kxx=kxx, kyy=kyy, kzz=kzz,
        c44=c44, wn=wn, a44n=a44n, b44_add=b44_add, elapsed=elapsed,
        panels=int(mesh.nb_faces), lid_panels=int(lid.nb_faces)))


def write_tables(name, hull, body, ds, rao, info) -> None:
    OUT.mkdir(parents=True, exist_ok=True)
    L, B, T = hull["length"], hull["beam"], hull["draught"]
    header = [
        f"# BEM reference RAOs, hull '{name}': {describe(hull)}",
        f"# made by tests/reference/make_bem_reference.py with capytaine {cpt.__version__}"
        f" (numpy {np.__version__}), deep water, rho {RHO}, g {G}",
        f"# mesh: {info['panels']} hull panels (port half mirrored, xOz symmetry) + "
        f"{info['lid_panels']} lid panels (irregular-frequency removal)",
        f"# displaced volume {info['volume']:.4f} m3, x_B {info['xb']:.4f} m, z_B {info['zb']:.4f} m"
        f" (below waterline), BM_T {info['bm']:.4f} m, GM_T {hull['gm']} m -> z_G {info['zg']:.4f} m",
        f"# mass {info['mass']:.1f} kg; radii of gyration about G: roll {info['kxx']:.3f} m,"
        f" pitch {info['kyy']:.3f} m, yaw {info['kzz']:.3f} m (0.35 B, 0.25 L, 0.25 L)",
        f"# C44 {info['c44']:.6e} N m/rad; undamped roll natural frequency {info['wn']:.5f} rad/s,"
        f" A44 there {info['a44n']:.6e} kg m2",
        f"# added linear roll damping b44_add_n_m_s = {info['b44_add']:.6e} N m s/rad"
        f" (ratio {ROLL_ZETA_ADD} of critical at that frequency), on top of wave damping",
        "# axes x forward, y port, z up, origin midship waterline; motions at G; mu_deg 180 head,"
        " 90 waves from port (clockwise); complex amplitudes in exp(+i omega t), phase re wave crest"
        " at origin; units m/m and rad/m",
        f"# solve time {info['elapsed']:.1f} s",
    ]
    cols = ["omega_rad_s", "mu_deg"]
    names = {"Heave": "heave", "Sway": "sway", "Roll": "roll", "Pitch": "pitch", "Yaw": "yaw"}
    for label in names.values():
        cols += [f"{label}_re", f"{label}_im"]
    rows = []
    betas = ds.wave_direction.values
    for iw, w in enumerate(ds.omega.values):
        for ib, beta in enumerate(betas):
            mu = (-np.rad2deg(beta)) % 360.0
            row = [w, mu]
            for dof in names:
                v = np.conj(complex(rao.sel(omega=w, wave_direction=beta, radiating_dof=dof)
                                    .values.squeeze()))
                row += [v.real, v.imag]
            rows.append(row)
    with open(OUT / f"{name}_rao.csv", "w", encoding="utf-8") as fh:
        fh.write("\n".join(header) + "\n" + ",".join(cols) + "\n")
        for row in rows:
            fh.write(",".join(f"{v:.6g}" for v in row) + "\n")
    # radiation coefficients (diagonal) for diagnostics
    coef_cols = ["omega_rad_s"]
    pairs = [("Heave", "Heave"), ("Pitch", "Pitch"), ("Heave", "Pitch"), ("Sway", "Sway"),
             ("Roll", "Roll"), ("Sway", "Roll"), ("Yaw", "Yaw")]
    for a, b in pairs:
        coef_cols += [f"a_{a.lower()}_{b.lower()}", f"b_{a.lower()}_{b.lower()}"]
    with open(OUT / f"{name}_coefficients.csv", "w", encoding="utf-8") as fh:
        fh.write("\n".join(header[:3]) + "\n# added mass / damping about G, SI units\n")
        fh.write(",".join(coef_cols) + "\n")
        for w in ds.omega.values:
            row = [w]
            for a, b in pairs:
                row.append(float(ds.added_mass.sel(omega=w, influenced_dof=a, radiating_dof=b)))
                row.append(float(ds.radiation_damping.sel(omega=w, influenced_dof=a,
                                                          radiating_dof=b)))
            fh.write(",".join(f"{v:.6g}" for v in row) + "\n")
    sec = sections_table(name)
    with open(OUT / f"{name}_sections.csv", "w", encoding="utf-8") as fh:
        fh.write(f"# sections of hull '{name}' ({describe(hull)}), analytic, same lines as the mesh\n")
        fh.write("x_m,beam_m,draught_m,area_m2\n")
        for r in sec:
            fh.write(",".join(f"{v:.6f}" for v in r) + "\n")


def describe(hull: dict) -> str:
    if hull["p"] is None:
        return f"box L {hull['length']} m, B {hull['beam']} m, T {hull['draught']} m"
    return (f"y = B/2 (1 - |2x/L|^{hull['p']}) (1 - |z/T|^{hull['q']}), L {hull['length']} m,"
            f" B {hull['beam']} m, T {hull['draught']} m")


if __name__ == "__main__":
    for hull_name in (sys.argv[1:] or list(HULLS)):
        print(f"hull {hull_name} ...", flush=True)
        run_hull(hull_name)
        print(f"hull {hull_name} done", flush=True)
