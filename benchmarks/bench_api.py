"""Speed of the API and exchange formats, as ratios to baselines measured in this run:

- one replay per Mechanism: .check() + .states + .check() on one object, against three plain
  replays (arrows.check) of the same mechanism;
- export: reaction SMILES and JSON of every gallery mechanism, against the replay alone (what an
  export must do anyway);
- numbering: `arrows number` on molecules from a chain to a fullerene, against RDKit reading and
  writing the same SMILES.

    python benchmarks/bench_api.py [--repeat 5]
"""
from __future__ import annotations

import argparse
import time
from pathlib import Path

from rdkit import Chem

import arrows
from arrows import mechanism_json
from arrows.numbering import numbered, numbered_smiles
from arrows.reaction_smiles import reaction_lines

ROOT = Path(__file__).resolve().parent.parent
GALLERY = sorted((ROOT / "gallery").glob("*.mech"))
MOLECULES = {
    "octane-2,7-dione": "CC(=O)CCCCC(C)=O",
    "cholesterol": "CC(C)CCCC(C)C1CCC2C1(CCC3C2CC=C4C3(CCC(C4)O)C)C",
    "strychnine": "O=C7N2c1ccccc1C64C2C3C(OCC=C5C3CC6N(CC4)C5)C7",
    "C60": "c12c3c4c5c1c1c6c7c2c2c8c3c3c9c4c4c%10c5c5c1c1c6c6c%11c7c2c2c7c8c3c3c8c9c4c4c9c%10c5c5c1c1c6c6"
           "c%11c2c2c7c3c3c8c4c4c9c5c1c1c6c2c3c41",
}


def best_of(repeat: int, work) -> float:
    times = []
    for _ in range(repeat):
        start = time.perf_counter()
        work()
        times.append(time.perf_counter() - start)
    return min(times)


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("--repeat", type=int, default=5)
    repeat = parser.parse_args().repeat
    texts = [(p.read_text(encoding="utf-8"), str(p)) for p in GALLERY]

    plain = best_of(repeat, lambda: [arrows.check(arrows.parse(t, n)) for t, n in texts for _ in range(3)])

    def cached():
        for t, n in texts:
            m = arrows.parse(t, n)
            m.check(), m.states, m.check()
    kept = best_of(repeat, cached)
    print(f"check+states+check on one Mechanism: {kept * 1000:.0f} ms for {len(texts)} files; "
          f"three plain replays {plain * 1000:.0f} ms; ratio {kept / plain:.2f} (one replay would be ~0.33 + states)")

    mechanisms = [arrows.parse(t, n) for t, n in texts]
    replay = best_of(repeat, lambda: [arrows.replay(m) for m in mechanisms])
    rxn = best_of(repeat, lambda: [reaction_lines(arrows.replay(m)) for m in mechanisms])
    js = best_of(repeat, lambda: [mechanism_json.dumps(m, arrows.replay(m)) for m in mechanisms])
    steps = sum(len(m.steps) for m in mechanisms)
    print(f"export of {len(mechanisms)} mechanisms ({steps} steps): replay alone {replay * 1000:.0f} ms; "
          f"replay + reaction SMILES {rxn * 1000:.0f} ms ({rxn / replay:.2f}x); "
          f"replay + JSON {js * 1000:.0f} ms ({js / replay:.2f}x)")

    for name, smiles in MOLECULES.items():
        floor = best_of(repeat, lambda: Chem.MolToSmiles(Chem.MolFromSmiles(smiles)))
        ours = best_of(repeat, lambda: numbered_smiles(numbered(smiles)))
        atoms = Chem.MolFromSmiles(smiles).GetNumAtoms()
        print(f"number {name} ({atoms} heavy atoms): {ours * 1000:.1f} ms, RDKit read+write {floor * 1000:.2f} ms, "
              f"ratio {ours / floor:.0f}x")


if __name__ == "__main__":
    main()
