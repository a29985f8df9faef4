"""Whole runs from the module: a dict and a file give the CLI's results and files; bad input
raises with the CLI's message; Ctrl-C stops a run; the README's Python snippet runs as printed."""
import contextlib
import io
import json
import os
import re
import signal
import subprocess
import sys
import tempfile
import textwrap
import time
import unittest

import numpy as np

import ember
from support import SOURCE, cli

# A cut-down monochromatic scan (invented numbers, as configs/monochromatic_scan.yaml).
SCENARIO = {
    "title": "module against command line (invented numbers)",
    "population": {"spectrum": {"shape": "monochromatic", "mass": "1e10 g"},
                   "abundance": {"measure": "beta", "value": 1e-40}},
    "tunnelling": {"prescriptions": ["entropy_drop", "probe_field", "no_seed"]},
    "scan": {"masses": {"from": "1 g", "to": "1e15 g", "points": 5}},
}


def setUpModule():
    global work, scenario_file, cli_summary
    work = tempfile.TemporaryDirectory(prefix="ember-python-run-")
    # The same scenario as a file (JSON is YAML): what the command line runs.
    scenario_file = os.path.join(work.name, "scenario.yaml")
    with open(scenario_file, "w") as f:
        json.dump(SCENARIO, f, indent=2)
    out, _ = cli("run", scenario_file, "-o", os.path.join(work.name, "cli"), "--no-plots", "--quiet", "--json")
    cli_summary = json.loads(out)


def tearDownModule():
    work.cleanup()


class SameAsCli(unittest.TestCase):
    def test_dict_gives_the_cli_numbers(self):
        r = ember.run(SCENARIO)
        for name, p in cli_summary["prescriptions"].items():
            self.assertEqual(r["N"][name], p["N_lightcone"], name)
            self.assertEqual(r["excluded"][name], p["excluded"], name)
            self.assertEqual(r["verdicts"][name], p["verdict"], name)
        self.assertEqual(r["summary"]["scenario_hash"], cli_summary["scenario_hash"])

    def test_curves_are_the_constraint_file(self):
        r = ember.run(SCENARIO)
        with open(os.path.join(work.name, "cli", "constraint.csv")) as f:
            lines = [line.strip() for line in f if not line.startswith("#")]
        header, rows = lines[0].split(","), [line.split(",") for line in lines[1:]]
        curve = r["curves"]["entropy_drop"]
        self.assertEqual(len(curve["mass_g"]), len(rows))
        beta = header.index("beta_max_entropy_drop")
        for i, row in enumerate(rows):
            self.assertTrue(np.isclose(curve["mass_g"][i], float(row[header.index("mass_g")]), rtol=1e-9))
            if row[beta] == "":  # an empty cell: no constraint there; masked, never NaN
                self.assertTrue(np.ma.is_masked(curve["beta_max"][i]))
            else:
                self.assertTrue(np.isclose(curve["beta_max"][i], float(row[beta]), rtol=1e-9))
        self.assertFalse(np.any(np.isnan(curve["beta_max"].filled(0.0))))

    def test_thresholds_are_the_cli_thresholds(self):
        # The top-mass thresholds (scan.thresholds, on by default) as the command line reports them
        # in summary.json and sensitivity.csv.
        r = ember.run(SCENARIO)
        t = r["thresholds"]["top_mass"]
        sens = cli_summary["sensitivity"]["top_mass"]
        self.assertEqual(t["critical_top_mass"], sens["critical_top_mass_GeV"])
        self.assertEqual(t["window"], tuple(sens["window_GeV"]))
        self.assertEqual(t["tolerance"], sens["root_tolerance_GeV"])
        with open(os.path.join(work.name, "cli", "sensitivity.csv")) as f:
            lines = [line.strip() for line in f if not line.startswith("#")]
        header, rows = lines[0].split(","), [line.split(",") for line in lines[1:]]
        for name, p in cli_summary["prescriptions"].items():
            self.assertEqual(t["prescriptions"][name]["threshold"], p["top_mass_threshold_GeV"], name)
            self.assertEqual(t["prescriptions"][name]["outruns_threshold"], p["top_mass_outruns_threshold_GeV"], name)
            mine = [row for row in rows if row[header.index("prescription")] == name]
            values = t["prescriptions"][name]["value"]
            n = t["prescriptions"][name]["N"]
            self.assertEqual(len(values), len(mine), name)
            for i, row in enumerate(mine):
                self.assertTrue(np.isclose(values[i], float(row[header.index("value")]), rtol=1e-9))
                cell = row[header.index("N_lightcone")]
                if cell == "":
                    self.assertTrue(np.ma.is_masked(n[i]))
                else:
                    self.assertTrue(np.isclose(n[i], float(cell), rtol=1e-8, atol=0), (name, i))
        # The scenario is excluded at its own top mass under entropy_drop (cli_summary) and the
        # vacuum is stable below the critical top mass: a flip exists between them.
        self.assertTrue(cli_summary["prescriptions"]["entropy_drop"]["excluded"])
        flip = t["prescriptions"]["entropy_drop"]["threshold"]
        self.assertTrue(t["critical_top_mass"] < flip < t["central"])

    def test_files_are_the_cli_files(self):
        out = os.path.join(work.name, "module")
        r = ember.run(scenario_file, output=out, threads=1)
        self.assertIn("constraint.csv", r["files"])
        for name in ("constraint.csv", "decay.csv", "rates.csv", "potential.csv", "resolved.yaml"):
            with open(os.path.join(out, name), "rb") as a, open(os.path.join(work.name, "cli", name), "rb") as b:
                self.assertEqual(a.read(), b.read(), name)
        self.assertFalse(os.path.exists(os.path.join(out, ".ember-checkpoint")))

    def test_scenario_file_and_dict_agree(self):
        self.assertEqual(ember.run(scenario_file)["N"], ember.run(SCENARIO)["N"])


class Errors(unittest.TestCase):
    def test_bad_scenario_has_the_cli_message(self):
        bad = os.path.join(SOURCE, "tests", "data", "bad", "unknown_key.yaml")
        _, err = cli("run", bad, "-o", os.path.join(work.name, "bad"), expect=2)
        with self.assertRaises(ember.ScenarioError) as caught:
            ember.run(bad)
        self.assertEqual("ember: " + str(caught.exception), err.strip())
        self.assertIsInstance(caught.exception, ember.InputError)
        # The same problem in a dict: the same message, located in the dict's YAML text.
        d = {"population": {"spectrum": {"shape": "lognormal", "peak_mass": "1e9 g", "widht": 0.5},
                            "abundance": {"measure": "beta", "value": 1e-20}}}
        with self.assertRaises(ember.InputError) as from_dict:
            ember.run(d)
        self.assertEqual(re.sub(r"^.*?:\d+:\d+: ", "", str(from_dict.exception)),
                         re.sub(r"^.*?:\d+:\d+: ", "", str(caught.exception)))

    def test_wrong_types(self):
        with self.assertRaises(ember.InputError):
            ember.run(42)
        with self.assertRaises(ember.InputError):
            ember.run({"population": {"spectrum": {"shape": "monochromatic", "mass": object()}}})


class Interrupt(unittest.TestCase):
    def test_ctrl_c_stops_a_run(self):
        # A scan long enough to be interrupted (about 15 s on one thread); SIGINT after 2 s must
        # stop it at the next scan row, as KeyboardInterrupt.
        child = textwrap.dedent(f"""
            import signal, sys, time
            signal.signal(signal.SIGINT, signal.default_int_handler)
            import ember
            s = {SCENARIO!r}
            s["scan"]["masses"]["points"] = 20000
            s["tunnelling"]["prescriptions"] = ["entropy_drop"]
            print("started", flush=True)
            try:
                ember.run(s, threads=1, use_cache=False)
                print("finished")
            except KeyboardInterrupt:
                print("interrupted")
        """)
        p = subprocess.Popen([sys.executable, "-c", child], stdout=subprocess.PIPE, text=True)
        self.assertEqual(p.stdout.readline().strip(), "started")
        time.sleep(2)
        p.send_signal(signal.SIGINT)
        sent = time.monotonic()
        out, _ = p.communicate(timeout=60)
        self.assertEqual(out.strip(), "interrupted")
        self.assertLess(time.monotonic() - sent, 5.0)


class Readme(unittest.TestCase):
    def test_python_snippet(self):
        with open(os.path.join(SOURCE, "README.md")) as f:
            text = f.read()
        section = text[text.index("## Use from Python"):]
        snippet = section[section.index("```python\n") + len("```python\n"):]
        snippet = snippet[:snippet.index("```")]
        printed = io.StringIO()
        with contextlib.redirect_stdout(printed):
            exec(compile(snippet, "README.md", "exec"), {})
        lines = printed.getvalue().splitlines()
        # What the README says it prints: the verdict and critical top mass at the central
        # inputs (README, Cautions: 170.97 GeV), and the exclusion (as `ember run` prints it).
        self.assertTrue(lines[0].startswith("metastable 170.97"), lines[0])
        self.assertEqual(lines[1], "EXCLUDED by a factor 5.98e+26")


class Example(unittest.TestCase):
    def test_example_draws_its_figures(self):
        try:
            import matplotlib  # noqa: F401
        except ImportError:
            self.skipTest("matplotlib is not installed (Debian: python3-matplotlib)")
        out = os.path.join(work.name, "example")
        subprocess.run([sys.executable, os.path.join(SOURCE, "examples", "constraint_plots.py"), out, "--points", "6"],
                       check=True, capture_output=True, timeout=300)
        for name in ("constraint.png", "sensitivity.png"):
            self.assertGreater(os.path.getsize(os.path.join(out, name)), 1000, name)


if __name__ == "__main__":
    unittest.main()
