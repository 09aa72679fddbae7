"""First-match lookup in a table of substructure entries (the acidity table, the bond-energy
table): each entry has a SMARTS whose first atom is the atom it is about; the first entry that
matches there wins, so specific entries come before general ones."""
from __future__ import annotations

from functools import lru_cache
from typing import Optional, Sequence, TypeVar

from rdkit import Chem

Entry = TypeVar("Entry")

# Set on the atom judged while a table is searched: each pattern's first atom also asks for it, so
# a search starts only there instead of finding every match in the molecule.
_SITE = "arrows_table_site"


@lru_cache(maxsize=None)
def _rooted(table: Sequence, element: int) -> tuple:
    """The entries of `table` that can be about an atom of `element`, in table order, each with its
    pattern rooted at the marked atom (_SITE) and its first atom as written when that atom can be
    tested alone: RDKit's substructure search tests each atom pair with the same Match, so an atom
    that fails it cannot start a match. A recursive ($(...)) first atom is only evaluated inside a
    full search, so it is never tested alone."""
    from rdkit.Chem import rdqueries   # a small module, loaded with the first lookup
    out = []
    for entry in table:
        pattern = Chem.MolFromSmarts(entry.smarts)
        if pattern is None:
            raise ValueError(f"bad SMARTS in a table: {entry.smarts}")
        first = pattern.GetAtomWithIdx(0)
        if first.GetAtomicNum() not in (0, element):
            continue   # the entry is about another element
        rooted = Chem.RWMol(pattern)
        rooted.GetAtomWithIdx(0).ExpandQuery(rdqueries.HasIntPropWithValueQueryAtom(_SITE, 1))
        out.append((entry, rooted.GetMol(), None if "$(" in first.GetSmarts() else first))
    return tuple(out)


def first_match(table: Sequence[Entry], mol: Chem.Mol, atom: int) -> Optional[Entry]:
    """The first entry of `table` (a tuple) whose SMARTS matches with its first atom at `atom` of
    `mol` (perceived: ring information and aromaticity set)."""
    target = mol.GetAtomWithIdx(atom)
    target.SetIntProp(_SITE, 1)
    try:
        for entry, rooted, first in _rooted(table, target.GetAtomicNum()):
            if first is not None and not first.Match(target):
                continue   # a quick no: the atom itself does not fit the entry's first atom
            if mol.HasSubstructMatch(rooted):
                return entry
        return None
    finally:
        target.ClearProp(_SITE)
