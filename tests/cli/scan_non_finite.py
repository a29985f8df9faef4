#!/usr/bin/env python3
"""Scans every output file under the given folders for a NaN or an infinity (no output may hold one).

Text files: a standalone nan, inf or infinity token (any case, any sign) on a data line (lines
starting with # carry the user's own words and are skipped). JSON files: also a null where the
writer would have put a non-finite number; null is legitimate only under keys listed below.
Prints each finding and exits 1 if there is any; prints how many files it read otherwise.
"""
import json
import math
import pathlib
import re
import sys

TOKEN = re.compile(r"(?<![A-Za-z0-9_])[-+]?(nan|inf|infinity)(?![A-Za-z0-9_])", re.IGNORECASE)
# Keys whose value may be null by design: "none" in the documented JSON schemas.
NULLABLE = {"instability_scale_GeV", "log10_expected_decays", "log10_decay_probability", "bounce_scale_GeV",
            "critical_top_mass_GeV", "critical_top_mass_effective_GeV", "bounce_action", "bounce_action_error",
            "operator_action_first_order", "operator_fraction_first_order", "B", "output", "beta_max", "f_max",
            "band_low", "band_high", "lambda6", "lambda8", "phi_horizon_GeV", "mass_left_g", "lightcone_count", "value",
            "tightest_scan_bound", "log10_unseeded_expected_decays", "failure", "prescription", "mass_g", "width",
            "log10_expected_decays_thermal", "beta", "f_pbh",
            # Thresholds: null where the window holds no crossing (the _note beside each says why).
            "top_mass_threshold_GeV", "top_mass_outruns_threshold_GeV", "higgs_mass_threshold_GeV",
            "higgs_mass_outruns_threshold_GeV", "alpha_s_threshold", "alpha_s_outruns_threshold"}
TEXT = {".csv", ".json", ".yaml", ".tsv", ".txt", ".stdout", ""}


def nulls(node, path, found):
    if isinstance(node, float) and not math.isfinite(node):
        found.append(f"{path} = {node}")
    if isinstance(node, dict):
        for key, value in node.items():
            if value is None and key not in NULLABLE:
                found.append(f"{path}.{key}")
            nulls(value, f"{path}.{key}", found)
    elif isinstance(node, list):
        for i, value in enumerate(node):
            if value is None:
                found.append(f"{path}[{i}]")
            nulls(value, f"{path}[{i}]", found)


def main(args):
    # --skip NAME: files of that name are not outputs (captured stderr quotes the user's input).
    skip = {args[i + 1] for i, a in enumerate(args) if a == "--skip"}
    folders = [a for i, a in enumerate(args) if a != "--skip" and (i == 0 or args[i - 1] != "--skip")]
    bad = files = 0
    for folder in folders:
        for f in sorted(pathlib.Path(folder).rglob("*")):
            if not f.is_file() or f.suffix not in TEXT or f.name in skip:
                continue
            files += 1
            text = f.read_text(errors="replace")
            if f.suffix != ".json":
                for n, line in enumerate(text.splitlines(), 1):
                    if not line.startswith("#") and TOKEN.search(line):
                        print(f"FAIL: {f}:{n}: non-finite value: {line[:120]}")
                        bad += 1
            else:
                # Strings in JSON may quote the user's input; numbers are checked after parsing
                # (json.loads reads NaN and Infinity literals as non-finite floats).
                found = []
                nulls(json.loads(text), "", found)
                for p in found:
                    print(f"FAIL: {f}: {p} (a null or non-finite number)")
                    bad += 1
    if files == 0:
        print(f"FAIL: no output files under {folders}")
        return 1
    print(f"scan_non_finite: {files} files, {bad} finding(s)")
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
