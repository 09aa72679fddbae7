"""What the chemical-judgement checks cost, as ratios to the replay of the same mechanisms
measured in the same run (best of N, so other load on the machine counts least).

(a) Ring closures (AR501/AR502/AR601), proton transfers (AR508) and stereo changes (AR602), each
    against `replay` on the gallery and on one long mechanism (400 enolate/ketone steps).
(b) `arrows closures` work for one species (find the candidates, write and replay a skeleton for
    each) against RDKit's floor of reading and sanitizing the same SMILES once per candidate.

Usage: python benchmarks/bench_judgement.py [--repeat N]
"""
from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from rdkit import Chem  # noqa: E402

from arrows.checks.protons import UphillProtonTransfers  # noqa: E402
from arrows.checks.rings import RingClosures  # noqa: E402
from arrows.checks.stereo import StereoChanges  # noqa: E402
from arrows.judgement.closures import find_closures, with_atom_maps  # noqa: E402
from arrows.judgement.skeleton import skeleton  # noqa: E402
from arrows.language import load, parse  # noqa: E402
from arrows.trace import replay  # noqa: E402


def best_of(repeat: int, work) -> float:
    best = float("inf")
    for _ in range(repeat):
        start = time.perf_counter()
        work()
        best = min(best, time.perf_counter() - start)
    return best


def enolate_shuttle(steps: int) -> str:
    """Octane-2,7-dione and hydroxide: the C3 enolate forms and is protonated again (demo data)."""
    lines = ['species dione = "[CH3:1][C:2](=[O:9])[CH2:3][CH2:4][CH2:5][CH2:6][C:7](=[O:10])[CH3:8]"',
             'species base = "[OH-:11]"']
    for k in range(steps):
        if k % 2 == 0:
            lines += [f'step "enolate {k + 1}"', "    :O11 -> H(C3)", "    C3-H -> C2=C3", "    C2=O9 -> O9", "end"]
        else:
            lines += [f'step "ketone {k + 1}"', "    :O9 -> C2=O9", "    C2=C3 -> C3-H(O11)", "    O11-H -> O11", "end"]
    return "\n".join(lines) + "\n"


def checks_against_replay(name: str, mechanisms: list, repeat: int) -> None:
    traces = [replay(m) for m in mechanisms]
    steps = sum(len(t.steps) for t in traces)
    base = best_of(repeat, lambda: [replay(m) for m in mechanisms])
    print(f" {name}: {steps} steps, replay {1000 * base / steps:.3f} ms/step (x1.00)")
    for check in (RingClosures(), UphillProtonTransfers(), StereoChanges()):
        cost = best_of(repeat, lambda: [list(check.run(t)) for t in traces])
        print(f"  {type(check).__name__:<22} {1000 * cost / steps:.3f} ms/step  (x{cost / base:.2f} of replay)")


def closures_against_rdkit(smiles_list: list[str], repeat: int) -> None:
    def ours():
        for smiles in smiles_list:
            mol = with_atom_maps(Chem.MolFromSmiles(smiles))
            for closure in find_closures(mol):
                skeleton(mol, closure, condense=True)

    counts = sum(len(find_closures(with_atom_maps(Chem.MolFromSmiles(s)))) for s in smiles_list)

    def floor():
        for smiles in smiles_list:
            for _ in range(max(1, counts // len(smiles_list))):
                Chem.MolToSmiles(Chem.MolFromSmiles(smiles))

    a, b = best_of(repeat, ours), best_of(repeat, floor)
    print(f" {len(smiles_list)} species, {counts} candidates: {1000 * a / counts:.2f} ms per candidate, "
          f"RDKit floor {1000 * b / counts:.3f} ms (x{a / b:.0f})")


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=5)
    args = parser.parse_args()
    print("(a) judgement checks against replay")
    gallery = [load(p) for p in sorted((ROOT / "gallery").glob("*.mech"))]
    checks_against_replay("gallery", gallery, args.repeat)
    checks_against_replay("one long mechanism", [parse(enolate_shuttle(400))], args.repeat)
    print("(b) arrows closures")
    closures_against_rdkit(["CC(=O)CCCC(C)=O", "CC(=O)CCC(C)=O", "CC(=O)CCCCC(C)=O", "O=CCCCCC(C)=O",
                            "CC(=O)CCCC=CC(=O)C", "CCOC(=O)CCCCC(=O)OCC"], args.repeat)


if __name__ == "__main__":
    main()
