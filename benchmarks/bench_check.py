"""How fast `arrows check` is, measured against RDKit in the same run.

(a) Checking cost per step: our replay + checks, against RDKit's bare floor for the same states:
    MolFromSmiles + SanitizeMol + MolToSmiles of each derived state's canonical SMILES.
    Target: ratio <= 3. Printed with a breakdown by stage so that a slow check is easy to find.
(b) Start-up: `arrows check FILE` as a subprocess, against `python -c "import rdkit.Chem"`,
    best of N, with every module byte-compiled first. Target: ratio <= 1.3. Also lists any drawing
    module the check path imported.
(c) Memory: peak RSS while checking 1,000 and 10,000 steps, both as many small mechanisms
    streamed one after another and as one long mechanism.

Usage: python benchmarks/bench_check.py [--repeat N] [--skip-memory]
The mechanisms are the gallery (or any .mech files given with --files) and generated proton
shuttles (demo data).
"""
from __future__ import annotations

import argparse
import os
import statistics
import subprocess
import sys
import textwrap
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent


def best_of(repeat: int, work) -> float:
    """Shortest wall time of `repeat` runs: the least disturbed by other load on the machine."""
    best = float("inf")
    for _ in range(repeat):
        start = time.perf_counter()
        work()
        best = min(best, time.perf_counter() - start)
    return best


# --- generated mechanisms (demo data) -----------------------------------------------------------

def proton_shuttle(steps: int) -> str:
    """Hydroxide and water pass one proton back and forth."""
    lines = ['species hydroxide = "[OH-:1]"', 'species water = "[OH2:2]"']
    for k in range(steps):
        base, acid = (1, 2) if k % 2 == 0 else (2, 1)
        lines += [f'step "shuttle {k + 1}"', f"    :O{base} -> H(O{acid})", f"    O{acid}-H -> O{acid}", "end"]
    return "\n".join(lines) + "\n"


def enolate_shuttle(steps: int) -> str:
    """Octane-2,7-dione and hydroxide: the C3 enolate forms and is protonated again, over and over
    (states of about thirty atoms, the size of the gallery's)."""
    lines = ['species dione = "[CH3:1][C:2](=[O:9])[CH2:3][CH2:4][CH2:5][CH2:6][C:7](=[O:10])[CH3:8]"',
             'species base = "[OH-:11]"']
    for k in range(steps):
        if k % 2 == 0:
            lines += [f'step "enolate {k + 1}"', "    :O11 -> H(C3)", "    C3-H -> C2=C3", "    C2=O9 -> O9", "end"]
        else:
            lines += [f'step "ketone {k + 1}"', "    :O9 -> C2=O9", "    C2=C3 -> C3-H(O11)", "    O11-H -> O11", "end"]
    return "\n".join(lines) + "\n"


# --- (a) cost per step -----------------------------------------------------------------------------

def per_step(named_texts: list[tuple[str, str]], repeat: int) -> float:
    from rdkit import Chem

    from arrows import parse
    from arrows.api import check
    from arrows.checks import _registry
    from arrows.rdkit_io import canonical
    from arrows.trace import replay

    mechanisms = [(name, parse(text, name)) for name, text in named_texts]
    steps = sum(len(m.steps) for _, m in mechanisms)
    states: list[str] = []
    written: list[str] = []
    for name, mechanism in mechanisms:
        trace, diags = check(mechanism)
        errors = [d for d in diags if d.severity == "error"]
        if errors:
            raise SystemExit(f"{name} does not check clean: {errors[0].to_text()}")
        states += [canonical(s.mol) for s in list(trace.states())[1:]]
        # What the check reads as written (each species, `uses` ones included, and each
        # checkpoint): the same RDKit work, counted in the wider floor.
        written += [sp.smiles for sp in mechanism.species] + [sp.smiles for st in mechanism.steps for sp in st.uses]
        written += [c.smiles for st in mechanism.steps for c in st.expects]
        written += [mechanism.product.smiles] if mechanism.product else []

    def ours():
        for _, mechanism in mechanisms:
            check(mechanism)

    # The checks the core asks for (structure, valence, conservation, checkpoints, ring sizes),
    # without the chemical judgement added later (pKa of proton transfers, stereo perception),
    # which reads every state through RDKit's perception once more.
    core = [c for c in _registry() if type(c).__name__ not in ("UphillProtonTransfers", "StereoChanges")]

    def ours_core():
        for _, mechanism in mechanisms:
            trace = replay(mechanism)
            for check_ in core:
                check_.run(trace)

    def floor(structures=states):
        for smiles in structures:
            mol = Chem.MolFromSmiles(smiles, sanitize=False)
            Chem.SanitizeMol(mol)
            Chem.MolToSmiles(mol)

    def wider_floor():
        floor(states + written)

    # Interleave the two so that both see the same machine load.
    ours_t = floor_t = core_t = wide_t = float("inf")
    paired = []   # each round's own ratio: robust to the machine's speed drifting between rounds
    for _ in range(repeat):
        ours_now, floor_now = best_of(1, ours), best_of(1, floor)
        ours_t, floor_t = min(ours_t, ours_now), min(floor_t, floor_now)
        paired.append(ours_now / floor_now)
        core_t = min(core_t, best_of(1, ours_core))
        wide_t = min(wide_t, best_of(1, wider_floor))
    ratio = ours_t / floor_t
    print(f"  {steps} steps, {len(states)} states: ours {1e3 * ours_t / steps:.3f} ms/step, "
          f"RDKit floor {1e3 * floor_t / steps:.3f} ms/step, ratio {ratio:.1f} (target <= 3); "
          f"median of the {repeat} rounds' own ratios {statistics.median(paired):.1f}")
    print(f"  core checks alone (no pKa or stereo judgement): {1e3 * core_t / steps:.3f} ms/step, "
          f"ratio {core_t / floor_t:.1f}")
    print(f"  against the wider floor that also reads the {len(written)} structures written in the files "
          f"(species, checkpoints, products): ratio {ours_t / wide_t:.1f} (for information; the target is "
          f"the ratio above)")

    # Where the time goes: the replay, the perceived view of every state (shared by the acidity and
    # stereo checks in a real run, counted again in each of their stages here), then each check alone.
    from arrows.judgement.perception import perceive
    traces = [replay(m) for _, m in mechanisms]
    stages = [("replay", lambda: [replay(m) for _, m in mechanisms]),
              ("perception", lambda: [perceive(s.mol) for t in traces for s in t.states()])]
    for check_ in _registry():
        stages.append((type(check_).__name__, lambda c=check_: [list(c.run(t)) for t in traces]))
    parts = [(label, best_of(repeat, work)) for label, work in stages]
    print("    " + ", ".join(f"{label} {1e3 * t / steps:.3f}" for label, t in parts if 1e3 * t / steps >= 0.001)
          + " (ms/step)")
    return ratio


# --- (b) start-up ----------------------------------------------------------------------------------

def console_script() -> str:
    beside = Path(sys.executable).with_name("arrows")
    if not beside.exists():
        raise SystemExit("the console script `arrows` is not installed beside this python (pip install -e .)")
    return str(beside)


def run_child(command: list[str]) -> tuple[float, float]:
    """(wall seconds, CPU seconds of the child): CPU time is less disturbed by other load."""
    start = time.perf_counter()
    child = subprocess.Popen(command, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    _, _, usage = os.wait4(child.pid, 0)
    return time.perf_counter() - start, usage.ru_utime + usage.ru_stime


def startup(mech_file: Path, repeat: int) -> float:
    commands = {
        "python -c 'import rdkit.Chem'": [sys.executable, "-c", "import rdkit.Chem"],
        # lark loaded as arrows loads it: on `re`, with the optional `regex` module hidden
        "python -c 'import rdkit.Chem, click, lark' (the dependencies alone)":
            [sys.executable, "-c", "import sys; sys.modules['regex'] = None; import rdkit.Chem, click, lark"],
        f"arrows check {mech_file.name}": [console_script(), "check", str(mech_file)],
    }
    # One run of each with bytecode writing on, so that every module imported is byte-compiled as a
    # user's second run finds it; without this, PYTHONDONTWRITEBYTECODE=1 (set in some environments)
    # makes each run recompile every edited module and the timing includes a cost no user pays.
    writing = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
    for label, command in commands.items():
        status = subprocess.run(command, capture_output=True, env=writing).returncode
        if status != 0:
            raise SystemExit(f"{label} exits {status}")
    print("  (each command ran once first with bytecode writing on: the timings below use compiled modules)")
    best = {label: (float("inf"), float("inf")) for label in commands}
    for _ in range(repeat):   # interleaved, best of each
        for label, command in commands.items():
            wall, cpu = run_child(command)
            best[label] = (min(best[label][0], wall), min(best[label][1], cpu))
    base_wall, base_cpu = best["python -c 'import rdkit.Chem'"]
    for label, (wall, cpu) in best.items():
        print(f"  {label}: {1e3 * wall:.0f} ms wall (x{wall / base_wall:.2f}), {1e3 * cpu:.0f} ms CPU "
              f"(x{cpu / base_cpu:.2f})")
    ratio = best[f"arrows check {mech_file.name}"][0] / base_wall
    print(f"  start-up ratio {ratio:.2f} (target <= 1.3)")
    probe = textwrap.dedent(f"""
        import sys
        from arrows.cli import main
        sys.argv = ["arrows", "check", {str(mech_file)!r}]
        try:
            main()
        except SystemExit:
            pass
        print("DRAWING", *sorted(m for m in sys.modules
                                 if m == "cairosvg" or m.startswith(("arrows.draw", "cairocffi"))))
    """)
    out = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True).stdout
    drawing = next(line.split()[1:] for line in out.splitlines() if line.startswith("DRAWING"))
    print(f"  drawing modules imported by the check path: {', '.join(drawing) if drawing else 'none'}")
    return ratio


# --- (c) memory ----------------------------------------------------------------------------------

# What `arrows check FILE` does (arrows.api.diagnose_file), on one file of N steps or on N files of
# one step each.
_MEMORY_PROBE = """
import resource, sys, tempfile
from pathlib import Path
sys.path.insert(0, {bench_dir!r})
from bench_check import proton_shuttle
from arrows.api import diagnose_file
steps, mode = int(sys.argv[1]), sys.argv[2]
folder = Path(tempfile.mkdtemp())
if mode == "one":
    path = folder / "long.mech"
    path.write_text(proton_shuttle(steps))
    assert not [d for d in diagnose_file(path) if d.severity == "error"]
else:
    path = folder / "short.mech"
    path.write_text(proton_shuttle(1))
    for _ in range(steps):
        assert not [d for d in diagnose_file(path) if d.severity == "error"]
print(resource.getrusage(resource.RUSAGE_SELF).ru_maxrss)
"""


def peak_rss_mb(steps: int, mode: str) -> float:
    probe = _MEMORY_PROBE.format(bench_dir=str(Path(__file__).resolve().parent))
    out = subprocess.run([sys.executable, "-c", probe, str(steps), mode], capture_output=True, text=True, check=True)
    return int(out.stdout.split()[-1]) / 1024   # ru_maxrss is in KiB on Linux


def memory() -> None:
    for mode, words in (("many", "one-step mechanisms streamed one after another"),
                        ("one", "steps in one mechanism")):
        small, large = peak_rss_mb(1_000, mode), peak_rss_mb(10_000, mode)
        print(f"  {words}: peak RSS {small:.0f} MB at 1,000, {large:.0f} MB at 10,000 "
              f"(x{large / small:.2f})")


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=7, help="runs per measurement; the best is kept")
    parser.add_argument("--files", nargs="*", type=Path, help="mechanisms to time (default: gallery/*.mech)")
    parser.add_argument("--skip-memory", action="store_true")
    args = parser.parse_args()
    files = args.files or sorted((ROOT / "gallery").glob("*.mech")) or [Path("/tmp/a.mech")]

    print("(a) checking cost per step, against RDKit's bare floor on the same states")
    print(f" gallery ({len(files)} files: short mechanisms, so the per-file set-up counts)")
    per_step([(f.name, f.read_text(encoding="utf-8")) for f in files], args.repeat)
    print(" one long mechanism: 400 enolate/ketone steps on octane-2,7-dione")
    per_step([("enolate-shuttle", enolate_shuttle(400))], max(2, args.repeat // 2))

    print("(b) start-up")
    startup(files[0], args.repeat)

    if not args.skip_memory:
        print("(c) memory")
        memory()


if __name__ == "__main__":
    main()
