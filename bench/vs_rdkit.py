#!/usr/bin/env python3
"""Batch throughput of phdose against RDKit's parse-plus-match rate, in one run.

Input: the 1,133 SMILES of ../shared/reference/iupac-pka-calibration.csv repeated --repeat
times. phdose: the release binary, `pka --input FILE --format jsonl` (parse, sites from every
pattern of data/groups.csv, pKa estimate, stored values, site interplay, JSON out), once with
`--jobs 1` and once on all cores. RDKit (PyPI `rdkit`): `Chem.MolFromSmiles` plus
`GetSubstructMatches` for the same SMARTS patterns of data/groups.csv, on one core. Also: the
cold start of `phdose pka CCO` and the peak RSS of a --rss-rows input.

Prints the ratios (README's performance section quotes them). Run from the repository root:

    python3 bench/vs_rdkit.py                 # builds with `cargo build --release`
    python3 bench/vs_rdkit.py --repeat 5 --rss-rows 100000   # a shorter run
"""
import argparse
import csv
import os
import subprocess
import sys
import tempfile
import time

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
CALIBRATION = os.path.join(ROOT, "..", "shared", "reference", "iupac-pka-calibration.csv")
GROUPS = os.path.join(ROOT, "data", "groups.csv")


def smiles_list():
    with open(CALIBRATION, newline="", encoding="utf-8") as f:
        return [row["smiles"] for row in csv.DictReader(f)]


def group_patterns():
    with open(GROUPS, newline="", encoding="utf-8") as f:
        lines = [l for l in f if not l.startswith("#")]
    return [row["smarts"] for row in csv.DictReader(lines)]


def build():
    target = os.environ.get("CARGO_TARGET_DIR", os.path.join(ROOT, "target"))
    subprocess.run(["cargo", "build", "--release", "--quiet"], cwd=ROOT, check=True)
    return os.path.join(target, "release", "phdose")


def run_phdose(binary, path, db, jobs):
    args = [binary, "pka", "--input", path, "--format", "jsonl", "--db", db]
    if jobs:
        args += ["--jobs", str(jobs)]
    start = time.perf_counter()
    subprocess.run(args, check=True, stdout=subprocess.DEVNULL)
    return time.perf_counter() - start


def peak_rss_kb(binary, path, db):
    """Peak resident memory of one batch run, kilobytes. Measured by GNU time in its own small
    process: a child forked straight from this Python (RDKit loaded) would count Python's
    pages in its high-water mark, since that mark survives exec."""
    args = [binary, "pka", "--input", path, "--format", "jsonl", "--db", db]
    if os.path.exists("/usr/bin/time"):
        out = subprocess.run(
            ["/usr/bin/time", "-f", "%M"] + args,
            stdout=subprocess.DEVNULL,
            stderr=subprocess.PIPE,
            text=True,
            check=True,
        )
        return int(out.stderr.strip().splitlines()[-1])
    proc = subprocess.Popen(args, stdout=subprocess.DEVNULL)
    _, status, usage = os.wait4(proc.pid, 0)
    if status != 0:
        sys.exit(f"phdose failed on the RSS input (status {status})")
    return usage.ru_maxrss


def run_rdkit(smiles, patterns):
    from rdkit import Chem, RDLogger, rdBase

    RDLogger.DisableLog("rdApp.*")
    queries = [q for q in (Chem.MolFromSmarts(p) for p in patterns) if q is not None]
    start = time.perf_counter()
    parsed = 0
    for s in smiles:
        mol = Chem.MolFromSmiles(s)
        if mol is None:
            continue
        parsed += 1
        for q in queries:
            mol.GetSubstructMatches(q)
    return time.perf_counter() - start, len(queries), parsed, rdBase.rdkitVersion


def cold_start_ms(binary, db, runs=20):
    subprocess.run([binary, "pka", "CCO", "--db", db], check=True, stdout=subprocess.DEVNULL)
    best = float("inf")
    for _ in range(runs):
        start = time.perf_counter()
        subprocess.run([binary, "pka", "CCO", "--db", db], check=True, stdout=subprocess.DEVNULL)
        best = min(best, time.perf_counter() - start)
    return best * 1000


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeat", type=int, default=20, help="copies of the 1,133 SMILES")
    ap.add_argument("--rss-rows", type=int, default=1_000_000, help="rows of the RSS input (0: skip)")
    ap.add_argument("--binary", help="a phdose binary (default: build the release one)")
    a = ap.parse_args()

    binary = a.binary or build()
    base = smiles_list()
    patterns = group_patterns()
    with tempfile.TemporaryDirectory(prefix="phdose-bench-") as tmp:
        db = os.path.join(tmp, "store.sqlite")
        path = os.path.join(tmp, "input.smi")
        rows = base * a.repeat
        with open(path, "w", encoding="utf-8") as f:
            f.write("\n".join(rows) + "\n")
        cold = cold_start_ms(binary, db)
        one = run_phdose(binary, path, db, 1)
        many = run_phdose(binary, path, db, None)
        rd_time, n_queries, parsed, version = run_rdkit(rows, patterns)

        cores = os.cpu_count()
        print(f"input: {len(base)} calibration SMILES x {a.repeat} = {len(rows)} rows")
        print(f"patterns: {len(patterns)} in data/groups.csv, {n_queries} read by RDKit {version}")
        print(f"phdose pka --jobs 1:      {len(rows) / one:10.0f} rows/s")
        print(f"phdose pka, {cores} cores:     {len(rows) / many:10.0f} rows/s")
        print(f"RDKit parse+match, 1 core: {parsed / rd_time:10.0f} rows/s")
        print(f"ratio phdose/RDKit, one core: {(len(rows) / one) / (parsed / rd_time):.1f}x")
        print(f"scaling all cores / one core: {one / many:.2f}x on {cores} cores")
        print(f"cold start (pka CCO, best of 20): {cold:.1f} ms")
        if a.rss_rows:
            big = os.path.join(tmp, "big.smi")
            with open(big, "w", encoding="utf-8") as f:
                for i in range(a.rss_rows):
                    f.write(base[i % len(base)] + "\n")
            rss = peak_rss_kb(binary, big, db)
            print(f"peak RSS on {a.rss_rows} rows: {rss / 1024:.1f} MB")


if __name__ == "__main__":
    main()
