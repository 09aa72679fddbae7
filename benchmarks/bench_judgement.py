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
from bench_check import best_of, enolate_shuttle  # noqa: E402  (the same timing and demo mechanism)


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
