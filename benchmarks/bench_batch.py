"""Batch speed: `arrows collect` on 200 schemes with one and two worker processes, a warm-cache
re-run against a cold run, and `arrows check --jsonl` throughput in steps per second per core
next to RDKit's own floor for the same states, all measured in this run on this machine.

    python benchmarks/bench_batch.py [--schemes 200] [--records 2000] [--repeat 2]

Targets (issue "Supporting information in one command"): --jobs 2 at least 1.7x faster than
--jobs 1 on two cores; a warm re-run at least 20x faster than a cold run. The floor follows the
core issue: parsing, sanitizing and writing canonical SMILES of the same intermediate states with
bare RDKit; the checker's cost per step is reported as a multiple of it.
"""
from __future__ import annotations

import argparse
import json
import os
import re
import resource
import shutil
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
GALLERY = sorted((ROOT / "gallery").glob("*.mech"))
ARROWS = [sys.executable, "-c", "from arrows.cli import main; main()"]   # this interpreter's arrows


def scheme_folder(folder: Path, count: int) -> None:
    """count distinct schemes: the gallery over and over, each copy with its own title."""
    folder.mkdir(parents=True)
    for i in range(count):
        source = GALLERY[i % len(GALLERY)]
        text = re.sub(r'^title\s+"([^"]*)"', lambda m: f'title "{m.group(1)} ({i + 1})"', source.read_text(),
                      count=1, flags=re.M)
        (folder / f"{i + 1:03d}-{source.name}").write_text(text)


class Run:
    """Wall-clock and CPU seconds of one command (its worker processes included)."""

    def __init__(self, command: list[str]):
        before = resource.getrusage(resource.RUSAGE_CHILDREN)
        start = time.perf_counter()
        proc = subprocess.run(command, capture_output=True, text=True)
        self.wall = time.perf_counter() - start
        after = resource.getrusage(resource.RUSAGE_CHILDREN)
        self.cpu = (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)
        if proc.returncode not in (0, 1):
            raise SystemExit(f"{' '.join(command)} failed:\n{proc.stderr}")

    def __str__(self) -> str:
        # cores busy on average: about 1 for --jobs 1; below 2 for --jobs 2 when the machine is shared
        return f"{self.wall:.2f} s (cpu {self.cpu:.2f} s, {self.cpu / self.wall:.2f} cores busy)"


def best(runs: list[Run]) -> Run:
    """The least disturbed of several runs (shortest wall time): other load on the machine only
    ever slows a run down."""
    return min(runs, key=lambda run: run.wall)


def bench_collect(work: Path, count: int, repeat: int) -> None:
    folder = work / "schemes"
    scheme_folder(folder, count)
    runs = {}
    for jobs in (1, 2):
        runs[jobs] = best([Run([*ARROWS, "collect", str(folder), "-o", str(work / f"j{jobs}" / "si.pdf"),
                                "-j", str(jobs), "--cache", str(work / f"cache{jobs}-{n}")]) for n in range(repeat)])
    warm = best([Run([*ARROWS, "collect", str(folder), "-o", str(work / "j2" / "si.pdf"), "-j", "2",
                      "--cache", str(work / "cache2-0")]) for _ in range(3)])
    same = (work / "j1" / "si.pdf").read_bytes() == (work / "j2" / "si.pdf").read_bytes()
    print(f"collect, {count} schemes, cold cache (best of {repeat}):\n  --jobs 1 {runs[1]}\n  --jobs 2 {runs[2]}\n"
          f"  speed-up {runs[1].wall / runs[2].wall:.2f}x (target >= 1.7x); identical PDF: {same}")
    print(f"collect, {count} schemes, --jobs 2, warm re-run (best of 3): {warm}\n"
          f"  speed-up over the cold run {runs[2].wall / warm.wall:.1f}x (target >= 20x)")


def data_set(path: Path, count: int) -> None:
    texts = [p.read_text() for p in GALLERY]
    with path.open("w") as out:
        for i in range(count):
            out.write(json.dumps({"id": i, "text": texts[i % len(texts)]}) + "\n")


def rdkit_floor(path: Path) -> tuple[float, int]:
    """Seconds for bare RDKit to parse, sanitize and write canonical SMILES of every state after
    every step in the data set, and the number of steps."""
    from rdkit import Chem

    from arrows.api import check_text
    from arrows.trace import state_smiles

    states = []
    for line in path.open():
        trace, _ = check_text(json.loads(line)["text"])
        states.extend(state_smiles(s.after) for s in trace.steps if s.after is not None)
    start = time.perf_counter()
    for smiles in states:
        mol = Chem.MolFromSmiles(smiles)      # parses and sanitizes
        Chem.MolToSmiles(mol)
    return time.perf_counter() - start, len(states)


def bench_jsonl(work: Path, count: int) -> None:
    work.mkdir(parents=True)
    data = work / "set.jsonl"
    data_set(data, count)
    runs = {}
    for jobs in (1, 2):
        runs[jobs] = Run([*ARROWS, "check", "--jsonl", str(data), "-j", str(jobs), "-q",
                          "-o", str(work / f"results{jobs}.jsonl")])
    steps = sum(json.loads(line)["steps"] for line in (work / "results1.jsonl").open())
    floor_seconds, floor_steps = rdkit_floor(data)
    per_core = steps / runs[1].wall
    floor = floor_steps / floor_seconds
    print(f"check --jsonl, {count} records, {steps} steps:\n  --jobs 1 {runs[1]} = {per_core:.0f} steps/s/core\n"
          f"  --jobs 2 {runs[2]} = {steps / runs[2].wall:.0f} steps/s, speed-up {runs[1].wall / runs[2].wall:.2f}x")
    print(f"  RDKit floor (parse + sanitize + canonical SMILES of each derived state): {floor:.0f} steps/s; "
          f"checking costs {floor / per_core:.1f}x the floor per step (whole command, start-up included)")


def _spin(n: int) -> int:
    total = 0
    for i in range(n):
        total += i * i
    return total


def parallel_ceiling(n: int = 10_000_000) -> float:
    """What two processes of pure CPU work gain over one right now: the most any --jobs 2 run can
    gain on this machine at this moment (a shared or overcommitted host gives less than 2)."""
    from concurrent.futures import ProcessPoolExecutor

    start = time.perf_counter()
    _spin(n), _spin(n)
    serial = time.perf_counter() - start
    with ProcessPoolExecutor(2) as pool:
        list(pool.map(_spin, [1, 1]))
        start = time.perf_counter()
        list(pool.map(_spin, [n, n]))
        parallel = time.perf_counter() - start
    return serial / parallel


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--schemes", type=int, default=200)
    parser.add_argument("--records", type=int, default=2000)
    parser.add_argument("--repeat", type=int, default=2, help="cold runs of each kind; the best counts")
    args = parser.parse_args()
    print(f"{os.cpu_count()} cores; load average {os.getloadavg()[0]:.1f} at the start; arrows from {ROOT}")
    print(f"parallel ceiling before: two processes of pure CPU work run {parallel_ceiling():.2f}x faster than one")
    work = Path(tempfile.mkdtemp(prefix="arrows-bench-"))
    try:
        bench_collect(work / "collect", args.schemes, args.repeat)
        bench_jsonl(work / "jsonl", args.records)
        print(f"parallel ceiling after: {parallel_ceiling():.2f}x")
        print(f"load average {os.getloadavg()[0]:.1f} at the end (above the core count: ratios are understated)")
    finally:
        shutil.rmtree(work, ignore_errors=True)


if __name__ == "__main__":
    main()
