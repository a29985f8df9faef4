#!/usr/bin/python3
"""scripts/plot's figures, checked as a reader would check them: a title, axis labels with units,
log axes labelled at round powers of ten, limits that follow the data, a label on every reference
line, the scenario marked, 1 and 2 sigma bands, f_PBH on its own panel with the CSV's f_max.
Results come from the built binary on two small invented scenarios; the figures are built
in-process (scripts/plot's own functions), and the script is also run once as users run it.
Usage: test_plot.py EMBER_BINARY SOURCE_DIR   (exit 77: skipped, matplotlib is not installed)
"""
import csv
import importlib.machinery
import importlib.util
import math
import os
import re
import subprocess
import sys
import tempfile

try:
    import matplotlib  # noqa: F401
except ImportError:
    print("test_plot: skipped: python3-matplotlib is not installed")
    sys.exit(77)

ember, source = sys.argv[1], sys.argv[2]
failures = []
checks = 0


def check(ok, what):
    global checks
    checks += 1
    if not ok:
        failures.append(what)
        print(f"FAIL: {what}")


def load_plot():
    sys.dont_write_bytecode = True  # no __pycache__ left in the source tree
    loader = importlib.machinery.SourceFileLoader("plot", os.path.join(source, "scripts", "plot"))
    spec = importlib.util.spec_from_loader("plot", loader)
    module = importlib.util.module_from_spec(spec)
    loader.exec_module(module)
    return module


# Invented scenarios, small enough for the per-commit tier. The band one varies M_t (five points
# over 2 sigma: 1 sigma points exist) and alpha_s (which moves beta_max here); the lognormal one is
# a width scan with a prescription that gives no bound (no_seed).
SCENARIOS = {
    "band": """title: "plot test: monochromatic with a band (invented numbers)"
population:
  spectrum: {shape: monochromatic, mass: 1e8 g}
  abundance: {measure: beta, value: 1e-69}
tunnelling: {prescriptions: [probe_field]}
scan:
  masses: {from: 1 g, to: 1e14 g, points: 5}
  band:
    top_mass: {span: 2, points: 5}
    alpha_s: {span: 2, points: 3}
  thresholds: {points: 5, tolerance: 0.2}
output: {directory: unused}
""",
    "widths": """title: "plot test: lognormal width scan (invented numbers)"
population:
  spectrum: {shape: lognormal, peak_mass: 1e9 g, width: 0.7}
  abundance: {measure: beta, value: 1e-72}
tunnelling: {prescriptions: [probe_field, no_seed]}
scan:
  masses: {from: 1e3 g, to: 1e12 g, points: 5}
  widths: [0.7, 1.0]
  thresholds: {inputs: []}
output: {directory: unused}
""",
}

SUPERSCRIPTS = "\u207b\u2070\u00b9\u00b2\u00b3\u2074\u2075\u2076\u2077\u2078\u2079"
UNIT = re.compile(r"\[[^\]]+\]")  # every axis label names its unit in brackets ("dimensionless" too)


def run(work, name):
    path = os.path.join(work, f"{name}.yaml")
    with open(path, "w") as f:
        f.write(SCENARIOS[name])
    out = os.path.join(work, name)
    subprocess.run([ember, "run", path, "-o", out, "--no-plots", "--quiet", "--cache-dir",
                    os.path.join(work, "cache")], check=True, stdout=subprocess.DEVNULL)
    return out


def constraint_rows(folder):
    with open(os.path.join(folder, "constraint.csv")) as f:
        return list(csv.DictReader(line for line in f if not line.startswith("#")))


def check_log_axis(fig_name, axis, label):
    """Labelled ticks at 10^(k step) for one step of the plot's list (round powers), unlabelled
    minor ticks, and limits no more than a decade beyond the ticks (no wasted decades)."""
    low, high = sorted(axis.get_view_interval())
    majors = [t for t in axis.get_majorticklocs() if low <= t <= high]
    check(majors, f"{fig_name}: {label} log axis has labelled decades")
    exponents = [math.log10(t) for t in majors]
    check(all(abs(e - round(e)) < 1e-9 for e in exponents), f"{fig_name}: {label} major ticks at powers of ten")
    steps = {round(b) - round(a) for a, b in zip(exponents, exponents[1:])}
    check(len(steps) <= 1 and (not steps or steps.pop() in (1, 2, 5, 10, 20, 50, 100, 200, 500)),
          f"{fig_name}: {label} decades labelled at a round step")
    if len(exponents) > 1:
        step = round(exponents[1]) - round(exponents[0])
        check(all(round(e) % step == 0 for e in exponents), f"{fig_name}: {label} labels at multiples of the step")
    formatter = axis.get_major_formatter()
    for t in majors:
        text = formatter(t, 0)
        check(re.fullmatch(f"10[{SUPERSCRIPTS}]+", text) is not None, f"{fig_name}: {label} tick {t:g} labelled 10ⁿ ({text!r})")
    minor = axis.get_minor_formatter()
    check(all(minor(t, 0) == "" for t in axis.get_minorticklocs()), f"{fig_name}: {label} minor ticks unlabelled")


def reference_lines(ax):
    """axhline / axvline lines: drawn in axes coordinates along one direction."""
    return [ln for ln in ax.get_lines() if ln.get_transform() != ax.transData]


def check_figure(name, fig):
    axes = fig.axes
    check(axes and axes[0].get_title(), f"{name}: a title")
    check(UNIT.search(axes[-1].get_xlabel() or ""), f"{name}: x label with a unit ({axes[-1].get_xlabel()!r})")
    for ax in axes:
        check(UNIT.search(ax.get_ylabel() or ""), f"{name}: y label with a unit ({ax.get_ylabel()!r})")
        for which, axis in (("x", ax.xaxis), ("y", ax.yaxis)):
            if axis.get_scale() == "log":
                check_log_axis(name, axis, which)
        texts = [t.get_text() for t in ax.texts]
        for line in reference_lines(ax):
            text = getattr(line, "reference_text", None)
            check(text and text in texts, f"{name}: reference line labelled where drawn ({text!r})")


def main():
    plot = load_plot()
    with tempfile.TemporaryDirectory() as work:
        folders = {name: run(work, name) for name in SCENARIOS}
        for scenario, folder in folders.items():
            results = plot.Results(folder)
            figs = {name: function(results) for name, function in plot.FIGURES}
            expected = {"constraint", "rates", "potential"} | ({"contributions"} if scenario == "widths" else {"sensitivity"})
            check({n for n, f in figs.items() if f is not None} == expected,
                  f"{scenario}: figures {sorted(n for n, f in figs.items() if f)}")
            for name, fig in figs.items():
                if fig is not None:
                    check_figure(f"{scenario}/{name}", fig)
            check_constraint(scenario, figs["constraint"], folder)
            check_references(scenario, figs)
            if figs.get("sensitivity") is not None:
                check_sensitivity(scenario, figs["sensitivity"], folder)
        check_same_bytes(plot, folders["band"])
        check_script(folders["widths"])
    print(f"{checks - len(failures)} passed, {len(failures)} failed")
    return 1 if failures else 0


def check_constraint(scenario, fig, folder):
    rows = constraint_rows(folder)
    top, bottom = fig.axes
    where = f"{scenario}/constraint"
    check(top.get_shared_x_axes().joined(top, bottom), f"{where}: beta and f_PBH panels share the mass axis")
    check("PBH" in bottom.get_ylabel() and bottom.get_yscale() == "log", f"{where}: an f_PBH panel, log")
    # The f panel's curves are the CSV's f_max columns, row by row (not beta times a fixed factor).
    want = sorted(float(r[k]) for r in rows for k in r if k.startswith("f_max_") and r[k])
    drawn = sorted(y for ln in bottom.get_lines() if ln.get_transform() == bottom.transData and ln.get_alpha() != 0
                   and ln.get_marker() != "*" for y in ln.get_ydata())
    check(len(want) == len(drawn) and all(math.isclose(a, b, rel_tol=1e-12) for a, b in zip(want, drawn)),
          f"{where}: f panel draws constraint.csv's f_max ({len(drawn)} points, {len(want)} in the CSV)")
    # No wasted decades: beyond the drawn values (bands included) the beta axis extends by at most
    # 5% of their span (matplotlib's default axes margin: common practice), or one decade where
    # the span is short (the plot widens those to whole decades so a power of ten is labelled).
    values = [float(r[k]) for r in rows for k in r
              if (k.startswith("beta_max_") or k.startswith("band")) and "without" not in k and r[k] and float(r[k]) > 0]
    low, high = top.get_ylim()
    span = math.log10(max(values)) - math.log10(min(values))
    allowed = max(0.05 * span, 1.0)
    check(0 <= math.log10(min(values)) - math.log10(low) <= allowed and 0 <= math.log10(high) - math.log10(max(values)) <= allowed,
          f"{where}: beta limits follow the data ({low:.2g}..{high:.2g} for {min(values):.2g}..{max(values):.2g})")
    labels = top.get_legend().get_texts() if top.get_legend() else []
    texts = [t.get_text() for t in labels]
    # The scenario where constraint.csv's header puts it: a star at its (mass, beta) inside the
    # window, or an arrow naming it at the top edge when it is far above.
    with open(os.path.join(folder, "constraint.csv")) as f:
        point = next(line for line in f if line.startswith("# scenario-point: "))
    mass, beta = (float(x) for x in point.split()[2:4])
    stars = [ln for ln in top.get_lines() if ln.get_marker() == "*"]
    if low <= beta <= high:
        check(len(stars) == 1 and math.isclose(stars[0].get_xdata()[0], mass, rel_tol=1e-6)
              and math.isclose(stars[0].get_ydata()[0], beta, rel_tol=1e-6) and "this scenario" in stars[0].get_label(),
              f"{where}: the scenario starred at ({mass:g}, {beta:g})")
    else:
        check(any("this scenario" in t.get_text() and "far above" in t.get_text() for t in top.texts),
              f"{where}: the scenario far above, pointed to")
    if scenario == "band":
        # The 2 sigma envelope has width here; the 1 sigma one does not (only M_t moves within 1
        # sigma, and beta_max does not move with it): the figure says so rather than leave it out.
        check(any("2σ" in t for t in texts), f"{where}: the 2 sigma band in the legend")
        check(any("1σ" in t for t in texts), f"{where}: the 1 sigma band drawn or explained")
        check(len(top.collections) >= 1 and len(bottom.collections) >= 1, f"{where}: bands shaded on both panels")
    if scenario == "widths":
        check(any("no_seed" in t and "no bound" in t for t in texts), f"{where}: the unbounded prescription named")
        check(any("width 1" in t for t in texts) and any("width 0.7" in t for t in texts), f"{where}: one curve per width")
    check(any("own panel" in t.get_text() for t in (bottom.get_legend().get_texts() if bottom.get_legend() else [])),
          f"{where}: the f_PBH panel says why it is a panel")


def check_sensitivity(scenario, fig, folder):
    """The sensitivity figure against sensitivity.csv and summary.json: the curves are the CSV's
    N / max_decays, the measured 1 and 2 sigma ranges shaded at the scenario's M_t +- sigma, a
    labelled line at each threshold summary.json gives and at the critical top mass."""
    import json
    where = f"{scenario}/sensitivity"
    with open(os.path.join(folder, "summary.json")) as f:
        summary = json.load(f)
    with open(os.path.join(folder, "sensitivity.csv")) as f:
        rows = list(csv.DictReader(line for line in f if not line.startswith("#")))
    top, bottom = fig.axes
    check(top.get_shared_x_axes().joined(top, bottom), f"{where}: both panels share the M_t axis")
    low = top.get_ylim()[0]
    for name in summary["prescriptions"]:
        want = sorted((float(r["value"]), float(r["N_lightcone"])) for r in rows
                      if r["prescription"] == name and r["N_lightcone"] and r["failed"] == "0"
                      and float(r["N_lightcone"]) >= low)
        drawn = [ln for ln in top.get_lines() if ln.get_label() == name]
        got = sorted(zip(drawn[0].get_xdata(), drawn[0].get_ydata())) if drawn else []
        check(len(got) == len(want) and all(math.isclose(a[0], b[0]) and math.isclose(a[1], b[1], rel_tol=1e-12)
                                            for a, b in zip(got, want)),
              f"{where}: {name}'s curve is sensitivity.csv's N ({len(got)} points drawn, {len(want)} in the window)")
    refs = {getattr(ln, "reference_text", ""): ln.get_xdata()[0] for ln in top.get_lines()
            if getattr(ln, "reference_text", None)}
    seen = 0
    for name, p in summary["prescriptions"].items():
        t = p.get("top_mass_threshold_GeV")
        if t is None:
            continue
        seen += 1
        check(any(name in text and "verdict flips" in text and abs(x - t) < 1e-3 for text, x in refs.items()),
              f"{where}: {name}'s threshold {t:.3f} GeV drawn and labelled")
    check(seen >= 1, f"{where}: the scenario has a threshold in the window (else this test checks little)")
    crit = summary["sensitivity"]["top_mass"]["critical_top_mass_GeV"]
    check(any("critical" in text and abs(x - crit) < 1e-3 for text, x in refs.items()),
          f"{where}: the critical top mass {crit:.3f} GeV drawn")
    central = summary["sensitivity"]["top_mass"]["central_GeV"]
    sigma = summary["sensitivity"]["top_mass"]["sigma_GeV"]
    spans = sorted((round(min(p.get_xy()[:, 0]), 9), round(max(p.get_xy()[:, 0]), 9)) for p in top.patches)
    check(spans == sorted([(round(central - 2 * sigma, 9), round(central + 2 * sigma, 9)),
                           (round(central - sigma, 9), round(central + sigma, 9))]),
          f"{where}: the 1 and 2 sigma ranges shaded around M_t = {central} ({spans})")
    labels = [t.get_text() for t in top.get_legend().get_texts()] if top.get_legend() else []
    check("measured ±1σ" in labels and "measured ±2σ" in labels, f"{where}: the sigma ranges in the legend")


def check_references(scenario, figs):
    """The reference lines each figure must have: Γ_D = Γ_H and the semiclassical floor on rates,
    λ = 0 on the potential; the survivor mass on the widths scenario's contributions."""
    def refs(fig):
        return [getattr(ln, "reference_text", "") for ax in fig.axes for ln in reference_lines(ax)]

    check(any("Gamma_D = " in r for r in refs(figs["rates"])), f"{scenario}/rates: the Γ_D = Γ_H line")
    check(any("semiclassical floor" in r for r in refs(figs["rates"])), f"{scenario}/rates: the semiclassical floor")
    check(any(r.startswith("λ = 0") for r in refs(figs["potential"])), f"{scenario}/potential: the λ = 0 line")
    check(any("instability scale" in r for r in refs(figs["potential"])), f"{scenario}/potential: the instability scale")


def check_same_bytes(plot, folder):
    """The same results give the same files: each format saved twice, byte for byte."""
    import io
    fig = plot.constraint_figure(plot.Results(folder))
    fig.tight_layout()
    for fmt in ("png", "pdf", "svg"):
        copies = []
        for _ in range(2):
            buffer = io.BytesIO()
            fig.savefig(buffer, format=fmt, metadata=plot.METADATA.get(fmt))
            copies.append(buffer.getvalue())
        check(copies[0] == copies[1], f"constraint.{fmt}: the same bytes twice")


def check_script(folder):
    """The script as users run it: every figure in each asked-for format, nothing temporary left."""
    subprocess.run([sys.executable, os.path.join(source, "scripts", "plot"), folder, "--formats", "png,pdf,svg"],
                   check=True)
    for name in ("constraint", "rates", "contributions", "potential"):
        for fmt in ("png", "pdf", "svg"):
            path = os.path.join(folder, f"{name}.{fmt}")
            check(os.path.exists(path) and os.path.getsize(path) > 0, f"script: {name}.{fmt} written")
    check(not any(".tmp." in f for f in os.listdir(folder)), "script: no temporary file left")


if __name__ == "__main__":
    sys.exit(main())
