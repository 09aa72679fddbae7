"""Atom numbers for drafting: a map number on every heavy atom of a SMILES, so that an author can
write moves against them (`arrows number`).

The rule, for each molecule of the SMILES in the order written:
1. The main chain is a path of bonded heavy atoms that visits no atom twice (through rings too,
   so a ring is numbered around): the one with the most carbon ends (two if the molecule has
   two carbons it can join, heteroatoms inside the path are fine), then the longest, then the
   one that starts at a carbon, then the one whose branch points come earliest along it (lowest
   locants), then the one whose atoms come first in the SMILES.
2. The chain is numbered from its start.
3. Then, chain atom by chain atom, each unnumbered neighbour (carbons before other elements,
   then in SMILES order) and everything beyond it, depth first.
Numbers continue from one molecule to the next; `first` sets where they begin (so a second
species can carry numbers unique across a mechanism).

The longest-path search stops after a fixed budget of path extensions on very large ring systems
and keeps the best path found so far; the numbering stays the same from run to run.
"""
from __future__ import annotations


from rdkit import Chem

SEARCH_BUDGET = 50_000   # path extensions per molecule


def main_chain(mol: Chem.Mol, atoms: list[int]) -> list[int]:
    """The main chain of one molecule (atom indices in chain order)."""
    inside = set(atoms)
    neighbours = {i: sorted(n.GetIdx() for n in mol.GetAtomWithIdx(i).GetNeighbors() if n.GetIdx() in inside)
                  for i in atoms}
    carbon = {i: mol.GetAtomWithIdx(i).GetAtomicNum() == 6 for i in atoms}

    def full_key(path: list[int]) -> tuple:
        """Smaller is better (see the rule in the module docstring)."""
        on_path = set(path)
        locants = tuple(position for position, i in enumerate(path, 1) if any(n not in on_path for n in neighbours[i]))
        return (-(carbon[path[0]] + carbon[path[-1]]), -len(path), not carbon[path[0]], locants, tuple(path))

    best: tuple = full_key([min(atoms)])
    budget = SEARCH_BUDGET

    def consider(path: list[int]) -> None:
        nonlocal best
        # Most paths lose on carbon ends or length alone; only ties need the whole key.
        quick = (-(carbon[path[0]] + carbon[path[-1]]), -len(path))
        if quick <= best[:2]:
            key = full_key(path)
            if key < best:
                best = key

    # Depth first from each start, with a stack of its own rather than Python's (a chain of a
    # thousand carbons is deeper than Python's recursion limit).
    for start in sorted(atoms):
        path, visited = [start], {start}
        consider(path)
        pending = [iter(neighbours[start])]
        while pending and budget > 0:
            neighbour = next(pending[-1], None)
            if neighbour is None:
                pending.pop()
                visited.discard(path.pop())
            elif neighbour not in visited:
                budget -= 1
                path.append(neighbour)
                visited.add(neighbour)
                consider(path)
                pending.append(iter(neighbours[neighbour]))
    return list(best[-1])


def number_atoms(mol: Chem.Mol, first: int = 1) -> dict[int, int]:
    """Atom index -> map number for every atom of `mol` (a molecule without explicit hydrogens)."""
    numbers: dict[int, int] = {}

    def give(index: int) -> None:
        numbers[index] = first + len(numbers)

    def branches(index: int):
        """The atom's neighbours, carbons first (by index), as the walk visits them."""
        atom = mol.GetAtomWithIdx(index)
        return iter([n.GetIdx() for n in sorted(atom.GetNeighbors(), key=lambda n: (n.GetAtomicNum() != 6, n.GetIdx()))])

    def walk(index: int) -> None:
        """Number every atom reached from `index`, depth first (a stack of its own, as in main_chain)."""
        pending = [branches(index)]
        while pending:
            neighbour = next(pending[-1], None)
            if neighbour is None:
                pending.pop()
            elif neighbour not in numbers:
                give(neighbour)
                pending.append(branches(neighbour))

    fragments = sorted(Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False), key=min)
    for fragment in fragments:
        chain = main_chain(mol, list(fragment))
        for index in chain:
            give(index)
        for index in chain:
            walk(index)
    return numbers


def numbered(smiles: str, first: int = 1) -> Chem.Mol:
    """The molecule of `smiles` (Kekulé form, hydrogens implicit) with a map number on every atom.
    Raises ValueError with RDKit's reason when the SMILES cannot be read."""
    from .rdkit_io import read_smiles
    mol, reason, position = read_smiles(smiles)
    if mol is None:
        error = ValueError(reason)
        error.position = position   # 0-based offset into the SMILES, when RDKit gives one
        raise error
    mol = Chem.RemoveHs(mol)
    Chem.Kekulize(mol, clearAromaticFlags=True)
    for index, number in number_atoms(mol, first).items():
        mol.GetAtomWithIdx(index).SetAtomMapNum(number)
    return mol


def numbered_smiles(mol: Chem.Mol) -> str:
    """The SMILES in the order the author wrote it, Kekulé form (so the double bonds a move may name
    are visible), every atom with its map number."""
    return Chem.MolToSmiles(mol, canonical=False, kekuleSmiles=True)


def numbered_svg(mol: Chem.Mol, scale: float = 40.0) -> str:
    """A drawing with each atom's number written beside it (RDKit atom notes)."""
    from rdkit.Chem import rdDepictor
    from rdkit.Chem.Draw import rdMolDraw2D
    shown = Chem.Mol(mol)
    for atom in shown.GetAtoms():
        atom.SetProp("atomNote", str(atom.GetAtomMapNum()))
        atom.SetAtomMapNum(0)   # else RDKit writes ":7" into the atom label too
    drawer = rdMolDraw2D.MolDraw2DSVG(-1, -1)   # canvas sized to the molecule at this scale
    options = drawer.drawOptions()
    options.scalingFactor = scale              # pixels per unit of RDKit's 2D coordinates
    options.padding = 0.12
    options.annotationFontScale = 0.8
    options.minFontSize = 14
    options.prepareMolsBeforeDrawing = True
    rdDepictor.Compute2DCoords(shown, canonOrient=True)
    drawer.DrawMolecule(shown)
    drawer.FinishDrawing()
    return drawer.GetDrawingText()
