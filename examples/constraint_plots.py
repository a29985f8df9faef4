#!/usr/bin/env python3
"""Two figures from Python with the `ember` module (matplotlib; Debian's python3-matplotlib):

  constraint.png   the largest allowed beta against formation mass, per prescription, for a
                   monochromatic population (invented numbers, as configs/monochromatic_scan.yaml)
  sensitivity.png  how the Higgs inputs move it: lambda(mu) for several top masses, and the
                   scenario's N against the top mass with its thresholds and the measured range

Usage: PYTHONPATH=PREFIX/lib/python3/dist-packages python3 examples/constraint_plots.py [FOLDER] [--points N]
"""
import argparse
import os

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402

import ember  # noqa: E402


def scenario(points, top_mass=None):
    s = {
        "title": "one mass at a time (invented numbers)",
        "population": {"spectrum": {"shape": "monochromatic", "mass": "1e10 g"},
                       "abundance": {"measure": "beta", "value": 1e-40}},
        "tunnelling": {"prescriptions": ["entropy_drop", "probe_field", "hot_bubble"]},
        "scan": {"masses": {"from": "0.1 g", "to": "1e16 g", "points": points}},
    }
    if top_mass is not None:
        s["standard_model"] = {"top_mass": f"{top_mass} GeV"}
    return s


def constraint_figure(points, folder):
    r = ember.run(scenario(points))
    fig, ax = plt.subplots(figsize=(6, 4))
    for name, curve in r["curves"].items():
        if curve["beta_max"].count() > 0:  # masked where there is no constraint
            ax.loglog(curve["mass_g"], curve["beta_max"], label=name)
    ax.set_xlabel("formation mass M [g]")
    ax.set_ylabel(r"largest allowed $\beta$")
    ax.set_title("monochromatic holes (invented scenario)")
    ax.legend()
    fig.savefig(os.path.join(folder, "constraint.png"), bbox_inches="tight")
    plt.close(fig)


def sensitivity_figure(points, folder):
    top_masses = [171.5, 172.0, 172.57, 173.0, 173.5]
    mu = np.logspace(3, 18.5, 200)
    fig, (left, right) = plt.subplots(1, 2, figsize=(10, 4))
    fig.subplots_adjust(wspace=0.35)
    for mt in top_masses:
        sm = ember.StandardModel(top_mass=mt)
        left.semilogx(mu, sm.lambda_running(mu), label=f"$M_t$ = {mt} GeV ({sm.verdict})")
    left.axhline(0, color="grey", lw=0.5)
    left.set_xlabel(r"$\mu$ [GeV]")
    left.set_ylabel(r"$\lambda(\mu)$ ($\overline{\rm MS}$)")
    left.legend(fontsize=7)
    # The scenario's own N against M_t: the run's threshold search (scan.thresholds, on by default).
    t = ember.run(scenario(points))["thresholds"]["top_mass"]
    c, s = t["central"], t["sigma"]
    right.axvspan(c - 2 * s, c + 2 * s, color="0.85", label=r"measured $\pm 2\sigma$")
    right.axvspan(c - s, c + s, color="0.7", label=r"measured $\pm 1\sigma$")
    for name, p in t["prescriptions"].items():
        n = p["N"]
        keep = ~np.ma.getmaskarray(n) & (n.filled(0.0) > 0)
        if keep.any():
            line, = right.semilogy(p["value"][keep], n[keep], "o-", ms=3, label=name)
            if p["threshold"] is not None:
                right.axvline(p["threshold"], ls=":", color=line.get_color())
    if t["critical_top_mass"] is not None:
        right.axvline(t["critical_top_mass"], ls="-.", color="grey", label="critical top mass")
    right.axhline(1, ls="--", color="grey", lw=0.8)
    right.set_xlabel("$M_t$ [GeV]")
    right.set_ylabel("expected decays N in our past light cone")
    right.legend(fontsize=7)
    fig.savefig(os.path.join(folder, "sensitivity.png"), bbox_inches="tight")
    plt.close(fig)


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("folder", nargs="?", default="ember-out/python-example")
    parser.add_argument("--points", type=int, default=35, help="formation masses in the scan")
    a = parser.parse_args()
    os.makedirs(a.folder, exist_ok=True)
    constraint_figure(a.points, a.folder)
    sensitivity_figure(a.points, a.folder)
    print(f"wrote {a.folder}/constraint.png and {a.folder}/sensitivity.png")


if __name__ == "__main__":
    main()
