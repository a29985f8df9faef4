#!/usr/bin/env python3
"""Two figures from Python with the `ember` module (matplotlib; Debian's python3-matplotlib):

  constraint.png   the largest allowed beta against formation mass, per prescription, for a
                   monochromatic population (invented numbers, as configs/monochromatic_scan.yaml)
  sensitivity.png  how the Higgs inputs move it: lambda(mu) for several top masses, and the
                   tightest bound on beta against the top mass

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
    tightest = []
    for mt in top_masses:
        sm = ember.StandardModel(top_mass=mt)
        left.semilogx(mu, sm.lambda_running(mu), label=f"$M_t$ = {mt} GeV ({sm.verdict})")
        beta = ember.run(scenario(points, mt))["curves"]["entropy_drop"]["beta_max"]
        tightest.append(beta.min() if beta.count() > 0 else np.nan)
    left.axhline(0, color="grey", lw=0.5)
    left.set_xlabel(r"$\mu$ [GeV]")
    left.set_ylabel(r"$\lambda(\mu)$ ($\overline{\rm MS}$)")
    left.legend(fontsize=7)
    right.semilogy(top_masses, tightest, "o-")
    right.set_xlabel("$M_t$ [GeV]")
    right.set_ylabel(r"tightest $\beta_{\max}$ over the scan (entropy_drop)")
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
