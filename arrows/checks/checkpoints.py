"""`expect` and `product`: the derived state must contain the structures the author wrote.
Same structure means same RDKit canonical SMILES; a difference is explained atom by atom and bond
by bond, aligning the written structure with the closest derived fragment."""
from __future__ import annotations

from collections import Counter
from typing import Callable, Iterator, Optional

from rdkit import Chem

from ..diagnostics import Diagnostic
from ..electrons import ElectronState, Pair, StepChange, atom_label, order_word, pair
from ..judgement.perception import RecentViews
from ..model import Checkpoint, Location
from ..rdkit_io import atom_list, nuclide, rdkit_messages, read_smiles, reading_hint, sanitize, unreadable
from ..trace import StepTrace
from . import Check, Ending

_ORIGIN = "arrows_origin"   # atom property: index of the atom in the state Mol


class BondHistory:
    """What the steps replayed so far changed, by state atom index: `formed`, the bonds a step made
    and none broke again; `touched`, every bond a step made, broke or reordered; `atoms`, every
    atom a step touched. A bond of the derived state that no step made was in a species as
    written (toluene's own methyl)."""

    __slots__ = ("formed", "touched", "atoms")

    def __init__(self) -> None:
        self.formed: set[Pair] = set()
        self.touched: set[Pair] = set()
        self.atoms: set[int] = set()   # every atom a step touched

    def add(self, change: StepChange) -> None:
        self.atoms.update(change.touched_atoms)
        for i, j in change.broken:
            self.formed.discard(pair(i, j))
            self.touched.add(pair(i, j))
        for i, j in change.formed:
            self.formed.add(pair(i, j))
            self.touched.add(pair(i, j))
        self.touched.update(pair(i, j) for (i, j), _, _ in change.reordered)


class Fragment:
    """One connected piece: heavy atoms, hydrogens as counts, aromaticity perceived, maps removed.
    Its canonical SMILES is written when first asked for: a derived piece of another size than
    every written one is never compared. `keep_maps`: the piece (its own copy) still carries every
    map number, and loses those not in `keep_maps` just before its SMILES is written."""

    __slots__ = ("mol", "_smiles", "_keep_maps")

    def __init__(self, mol: Chem.Mol, smiles: Optional[str] = None, keep_maps: Optional[frozenset[int]] = None):
        self.mol = mol
        self._smiles = smiles
        self._keep_maps = keep_maps

    @property
    def smiles(self) -> str:
        if self._smiles is None:
            if self._keep_maps is not None:
                _clear_maps(self.mol, self._keep_maps)
            self._smiles = Chem.MolToSmiles(self.mol)
        return self._smiles


def _clear_maps(mol: Chem.Mol, keep_maps: frozenset[int]) -> None:
    atom_at = mol.GetAtomWithIdx
    for i in range(mol.GetNumAtoms()):   # by index: RDKit's Python atom iterator is several times slower
        atom = atom_at(i)
        number = atom.GetAtomMapNum()
        if number and number not in keep_maps:
            atom.SetAtomMapNum(0)


_REMOVE_HS = Chem.RemoveHsParameters()
_REMOVE_HS.removeMapped = True
_REMOVE_HS.removeDefiningBondStereo = True


def _prepared(mol: Chem.Mol, keep_maps: Optional[frozenset[int]], origins: bool,
              elements: Optional[tuple[int, ...]] = None) -> Chem.Mol:
    """`keep_maps` None keeps every map number, and sanitizes `mol` itself (the caller's own copy,
    not needed as it was); `origins`: each atom records its index in `mol` (_ORIGIN), for naming
    atoms in an explanation; `elements`: the atomic numbers, when known."""
    work = Chem.RWMol(mol) if origins or keep_maps is not None else mol
    if origins or keep_maps is not None:
        for i in range(work.GetNumAtoms()):   # by index: RDKit's Python atom iterator is several times slower
            atom = work.GetAtomWithIdx(i)
            if origins:
                atom.SetIntProp(_ORIGIN, i)
            number = atom.GetAtomMapNum()
            if number and number not in keep_maps:
                atom.SetAtomMapNum(0)
    sanitize(work, elements)
    if elements is not None and 1 not in elements:
        # No hydrogen atom to fold (most written structures): RemoveHs would only copy the Mol and
        # drop the rings just found, which the canonical SMILES then finds again at more cost
        # than writing it.
        return work
    return Chem.RemoveHs(work, _REMOVE_HS, sanitize=False)


def fragments(mol: Chem.Mol, keep_maps: Optional[frozenset[int]] = frozenset(), origins: bool = False,
              elements: Optional[tuple[int, ...]] = None, lazy: bool = False) -> list[Fragment]:
    """The pieces of `mol` prepared for comparison; `lazy`: each SMILES written when first asked for."""
    out = []
    for frag in Chem.GetMolFrags(_prepared(mol, keep_maps, origins, elements), asMols=True, sanitizeFrags=False):
        out.append(Fragment(frag) if lazy else Fragment(frag, Chem.MolToSmiles(frag)))
    return out


def _written_fragments(checkpoint: Checkpoint) -> tuple[Optional[list[Fragment]], str, frozenset[int], Optional[int]]:
    """The written structure's pieces, or None with RDKit's reason and where in the SMILES it stopped."""
    mol, _, _ = read_smiles(checkpoint.smiles, sanitize=False)   # sanitized once, by fragments()
    if mol is not None:
        # The bookkeeping follows electrons and connectivity, not configuration: a checkpoint written
        # with @ or / \ is compared as its constitution here; its configuration is AR603's (written_stereo.py).
        Chem.RemoveStereochemistry(mol)
        atoms = atom_list(mol)
        # A map number is written after a colon inside brackets: a SMILES without one has none
        # (most checkpoints), and its atoms need not be asked.
        maps = frozenset(a.GetAtomMapNum() for a in atoms if a.GetAtomMapNum()) if ":" in checkpoint.smiles \
            else frozenset()
        elements = tuple(a.GetAtomicNum() for a in atoms)
        try:
            return fragments(mol, None, elements=elements), "", maps, None   # the written structure keeps its maps
        except Exception:   # RDKit's full reading below says why, in its own words
            pass
    _, reason, position = read_smiles(checkpoint.smiles)
    return None, reason or "RDKit cannot sanitize it", frozenset(), position


def _derived_fragments(state: ElectronState, maps: frozenset[int], views: Optional[RecentViews]) -> list[Fragment]:
    """fragments(state.mol, maps), read off the state's shared perceived view when there is one:
    the view is the state sanitized with its hydrogen atoms folded into counts, as `_prepared`
    makes it, so only the map numbers are left to clear. A state with a piece of hydrogen alone (a
    free proton or hydride, H2: the view leaves them out), a written configuration or a partial
    view is prepared here."""
    if state.configured:
        # Compared as constitution, like the written side (the stereo check reports configuration).
        mol = Chem.Mol(state.mol)
        Chem.RemoveStereochemistry(mol)
        return fragments(mol, maps, elements=state.elements)
    if views is None or _holds_hydrogen_alone(state):
        return fragments(state.mol, maps, elements=state.elements)
    view = views.of(state)
    if not view.complete:
        return fragments(state.mol, maps, elements=state.elements)
    # Kept with the view: a state checked twice (the last checkpoint, then the product) or met
    # again by its contents writes each piece out once.
    key = ("checkpoint pieces", maps)
    pieces = view.memo.get(key)
    if pieces is None:
        # Each piece is a copy of its own, whose map numbers are cleared only if it is written out.
        pieces = view.memo[key] = [Fragment(frag, keep_maps=maps)
                                   for frag in Chem.GetMolFrags(view.mol, asMols=True, sanitizeFrags=False)]
    return pieces


# A hydrogen atom none of whose neighbours is another element (H+, H-, H2): one search in C++
# costs less than asking RDKit for the neighbours of each hydrogen atom.
_HYDROGEN_ALONE = Chem.MolFromSmarts("[#1;!$(*~[!#1])]")


def _holds_hydrogen_alone(state: ElectronState) -> bool:
    """Whether a hydrogen atom is bonded to no other atom than hydrogen (H+, H-, H2)."""
    return 1 in state.elements and state.mol.HasSubstructMatch(_HYDROGEN_ALONE)


def compare(state: ElectronState, checkpoint: Checkpoint, code: str, step: Optional[int],
            views: Optional[RecentViews] = None, read: Optional[dict] = None,
            history: Optional[BondHistory] = None) -> list[Diagnostic]:
    """Diagnostics for one checkpoint against one state (empty when it matches); `views` holds the
    perceived views of the states met lately, `read` the written structures already read in this
    replay (by SMILES), `history` the bonds the steps up to `state` made, broke or reordered."""
    if read is None:
        written, reason, maps, position = _written_fragments(checkpoint)
    else:
        if checkpoint.smiles not in read:
            read[checkpoint.smiles] = _written_fragments(checkpoint)
        written, reason, maps, position = read[checkpoint.smiles]
    if written is None:
        loc = checkpoint.loc
        if position is not None and checkpoint.smiles_loc.line:
            loc = Location(checkpoint.smiles_loc.file, checkpoint.smiles_loc.line, checkpoint.smiles_loc.column + position)
        return [Diagnostic("AR102", unreadable("the checkpoint SMILES", reason), loc,
                           hint=reading_hint(reason, "check brackets, ring-closure digits and charges"), step=step)]
    derived = _derived_fragments(state, maps, views)
    # Equal canonical SMILES means an equal number of atoms: only pieces of a written size are
    # written out and compared; the others are left over as they are.
    sizes = {f.mol.GetNumAtoms() for f in written}
    pool = Counter(f.smiles for f in derived if f.mol.GetNumAtoms() in sizes)
    missing = []
    for frag in written:
        if pool[frag.smiles] > 0:
            pool[frag.smiles] -= 1
        else:
            missing.append(frag)
    what = "product" if code == "AR402" else "checkpoint"
    diags = []
    if missing:   # the same fragments, now with each atom's index in the state, to name atoms
        derived = fragments(state.mol, maps, origins=True)
    explained: set[int] = set()   # derived pieces already set against a written one
    written_smiles = {w.smiles for w in written}
    for frag in missing:
        candidates = [f for f in derived if f.smiles not in written_smiles] or derived
        # Two written pieces alike (`expect all "O.O"`) are each set against a derived piece of their
        # own: against the same one, both said the same and the second derived piece went unmentioned.
        candidates = [f for f in candidates if id(f) not in explained] or candidates
        closest = _closest(frag.mol, candidates)
        if closest is not None:
            explained.add(id(closest))
        details, hint = _explain(frag, closest, state, what, history) if closest is not None else ([], None)
        message = f"the {what} {frag.smiles} is not in the derived state"
        if closest is not None and _resonance_forms(frag.smiles, closest.smiles):
            message = f"the {what} {frag.smiles} is a resonance form of the derived {closest.smiles}"
            hint = ("write the form the moves reach, or add a `resonance` step that moves the electrons to the "
                    "form written")
        elif closest is not None and hint is None and _tautomers(frag.smiles, closest.smiles):
            message = f"the {what} {frag.smiles} is a tautomer of the derived {closest.smiles}, not the same form"
            hint = ("add the proton transfers that turn one form into the other (a keto-enol tautomerisation "
                    "takes two), or write the form the moves reach")
        if closest is not None and sum(f.smiles == closest.smiles for f in derived) <= sum(
                w.smiles == closest.smiles for w in written):
            # Every derived piece like this one is written already (`[Br-]` and `[BrH]` both written
            # where the moves leave one bromine): the written piece is one too many, and the derived
            # form is not to be suggested again.
            hint = (f"`{closest.smiles}`, the derived piece closest to it, is written already, and the state holds "
                    f"nothing else like `{frag.smiles}`: drop `{frag.smiles}` if it is one too many, "
                    f"or compare with `arrows trace`")
        elif closest is not None and hint == _PROTON_HINT:
            # Or the structure was written without the charge the moves leave (a carboxylate
            # written as the acid): the derived form is named, for the author to choose.
            hint += f"; if the moves are right as they are, write the {what} as `{closest.smiles}`"
        if details:
            message += ": " + "; ".join(details)
            if message.startswith(f"the {what} {frag.smiles} is not in") and f"`{closest.smiles}`" not in (hint or ""):
                # The structure the moves reach, as the author would write it: to compare, or paste
                # where it has the written atoms (an isomer, another charge or proton count).
                gives = f"the moves give `{_unmapped_smiles(closest.mol)}`, the piece closest to it"
                if hint:
                    hint = f"{hint}; {gives}"
                elif _heavy_atoms(frag.mol) == _heavy_atoms(closest.mol):
                    hint = (f"{gives}: if the moves are right, write the {what} as that; "
                            f"else compare with `arrows trace`")
                else:
                    hint = f"{gives}; compare with `arrows trace`"
        else:
            message += f" (derived: {'.'.join(f.smiles for f in derived)})"
        diags.append(Diagnostic(code, message, checkpoint.loc, hint=hint or "compare with `arrows trace`", step=step))
    leftovers = [] if missing or not checkpoint.whole_state else [
        f for f in derived if f.mol.GetNumAtoms() not in sizes or (pool[f.smiles] > 0 and not pool.subtract({f.smiles: 1}))]
    if leftovers:
        extra = ".".join(f.smiles for f in leftovers)
        diags.append(Diagnostic(code, f"`all` was asked, but the state also holds {extra}", checkpoint.loc,
                                hint="write every fragment, or drop `all`", step=step))
    return diags


def _heavy_atoms(piece: Chem.Mol) -> Counter:
    return Counter(a.GetAtomicNum() for a in atom_list(piece) if a.GetAtomicNum() > 1)


def _unmapped_smiles(piece: Chem.Mol) -> str:
    """RDKit's canonical SMILES of a derived piece without its map numbers."""
    work = Chem.Mol(piece)
    _clear_maps(work, frozenset())
    return Chem.MolToSmiles(work)


def _both_read(written: str, derived: str) -> Optional[list[Chem.Mol]]:
    """The two SMILES of a mismatch read by RDKit; None when they are equal or one cannot be read."""
    if written == derived:
        return None
    with rdkit_messages():
        mols = [Chem.MolFromSmiles(smiles) for smiles in (written, derived)]
    return None if any(m is None for m in mols) else mols


def _resonance_forms(written: str, derived: str) -> bool:
    """Whether two different SMILES draw one species with its electrons placed otherwise: the same
    atoms joined the same way, each with the same hydrogens, and the same net charge (an acylium
    written C[C+]=O for the derived CC#[O+]). Asked only of a mismatch."""
    mols = _both_read(written, derived)
    return (mols is not None and Chem.GetFormalCharge(mols[0]) == Chem.GetFormalCharge(mols[1])
            and _skeleton(mols[0]) == _skeleton(mols[1]))


def _skeleton(mol: Chem.Mol) -> str:
    """The molecule's sigma framework with each atom's hydrogens, as a canonical SMILES: every bond
    single, no charges, the hydrogen count carried as the map number."""
    work = Chem.RWMol(mol)
    for atom in work.GetAtoms():
        atom.SetAtomMapNum(atom.GetTotalNumHs() + 1)
        atom.SetFormalCharge(0)
        atom.SetIsAromatic(False)
        atom.SetNumExplicitHs(0)
        atom.SetNoImplicit(True)
    for bond in work.GetBonds():
        bond.SetBondType(Chem.BondType.SINGLE)
        bond.SetIsAromatic(False)
    return Chem.MolToSmiles(work)


def _tautomers(written: str, derived: str) -> bool:
    """Whether two different SMILES are tautomers of one another, as RDKit's tautomer enumerator
    judges (both canonicalised to one form): asked only of a mismatch."""
    mols = _both_read(written, derived)
    if mols is None:
        return False
    from rdkit.Chem.MolStandardize import rdMolStandardize   # only a mismatch asks
    with rdkit_messages():
        enumerator = rdMolStandardize.TautomerEnumerator()
        forms = [Chem.MolToSmiles(enumerator.Canonicalize(m)) for m in mols]
    return forms[0] == forms[1]


def _closest(written: Chem.Mol, candidates: list[Fragment]) -> Optional[Fragment]:
    """The derived piece closest to the written one: the one whose largest common part with it
    (elements alike, bonds of any order) leaves out the fewest atoms of either, 2 * common - atoms
    written - atoms derived. Counting the elements alone, a written dioxane had more in common
    with the tosylate beside the derived dioxolane (six C and two O against five and two), and was
    explained against it. The element count bounds the common part from above: a piece whose
    bound is below the best score found is not searched."""
    if len(candidates) < 2:
        return candidates[0] if candidates else None
    size = written.GetNumAtoms()
    elements = Counter(a.GetAtomicNum() for a in atom_list(written))

    def bound(f: Fragment) -> tuple[int, int]:
        common = sum((elements & Counter(a.GetAtomicNum() for a in atom_list(f.mol))).values())
        return 2 * common - size - f.mol.GetNumAtoms(), -abs(size - f.mol.GetNumAtoms())

    ranked = sorted(((bound(f), n, f) for n, f in enumerate(candidates)), key=lambda x: (x[0], -x[1]), reverse=True)
    best, best_key = None, None
    for (upper, nearness), n, f in ranked:
        if best_key is not None and upper < best_key[0]:
            break
        common = _common_size(written, f.mol) if upper > -size - f.mol.GetNumAtoms() else 0
        key = (2 * common - size - f.mol.GetNumAtoms(), upper, nearness, -n)
        if best_key is None or key > best_key:
            best, best_key = f, key
    return best


def _common_size(a: Chem.Mol, b: Chem.Mol) -> int:
    """The atoms of a largest connected common part of `a` and `b`: elements alike, any bond order."""
    if min(a.GetNumAtoms(), b.GetNumAtoms()) < 2:
        return min(a.GetNumAtoms(), b.GetNumAtoms()) if {x.GetAtomicNum() for x in atom_list(a)} & {
            x.GetAtomicNum() for x in atom_list(b)} else 0
    from rdkit.Chem import rdFMCS   # only a mismatch is explained: spared on every clean check
    result = rdFMCS.FindMCS([a, b], atomCompare=rdFMCS.AtomCompare.CompareElements,
                            bondCompare=rdFMCS.BondCompare.CompareAny, ringMatchesRingOnly=False,
                            completeRingsOnly=False, matchValences=False, timeout=1)
    return result.numAtoms


def _alignment(written: Chem.Mol, derived: Chem.Mol, history: Optional[BondHistory] = None) -> dict[int, int]:
    """written atom index -> derived atom index, by maps when the checkpoint has them, else the
    pairing with the fewest differences: it grows from a largest common part of the two (elements
    must match, bond orders may differ) and, when the atoms left out are alike on both sides (the
    same formula joined otherwise), pairs those too. Of pairings with as few differences, the one
    with more of them where the steps acted (`history`): a written meta-cymene against the para
    isomer the moves made is told at the isopropyl the arrows attached, not at toluene's methyl."""
    by_map = {a.GetAtomMapNum(): a.GetIdx() for a in atom_list(derived) if a.GetAtomMapNum()}
    mapped = {a.GetIdx(): by_map[a.GetAtomMapNum()] for a in atom_list(written)
              if a.GetAtomMapNum() and a.GetAtomMapNum() in by_map}
    if mapped:
        return mapped
    heavy = [sum(a.GetAtomicNum() > 1 for a in atom_list(m)) for m in (written, derived)]
    placements = _common_part_placements(written, derived, with_hydrogens=False)
    if not placements or len(placements[0]) < max(heavy):
        # The largest common part by element alone can sit on the wrong atoms: with a tert-butyl
        # on a nitrile's C where the checkpoint has it on the N, the part C(C)(C)N pairs the
        # nitrile carbon with the tert-butyl's centre and that centre with a methyl. Atoms that
        # also keep their hydrogens are the likelier same atoms. (A part that covers every atom
        # sits every way the two are alike: the search by hydrogens, several times slower on a
        # steroid, is then spared.)
        placements += _common_part_placements(written, derived, with_hydrogens=True)
    # The largest piece the species brought in, as the steps found it: the largest common part of
    # the whole can be the piece the arrows attached (an isopropyl on toluene's para carbon, written
    # meta), with toluene's own methyl then paired with a ring carbon that does not bear it.
    placements += _brought_in_placements(written, derived, history)
    # The most atoms paired, then the fewest differences: a pairing that leaves atoms out is not
    # made better by the differences it then cannot see, and of a symmetric part's placements the
    # mirrored ones do not make right atoms look wrong.
    completed = {tuple(sorted(align.items())): align
                 for align in (_completed(written, derived, placement) for placement in placements)}
    return min(completed.values(), key=lambda align: (-len(align), _differences(written, derived, align),
                                                      -_at_the_arrows(written, derived, align, history)), default={})


def _origin(derived: Chem.Mol, index: int) -> int:
    atom = derived.GetAtomWithIdx(index)
    return atom.GetIntProp(_ORIGIN) if atom.HasProp(_ORIGIN) else -1


def _brought_in_placements(written: Chem.Mol, derived: Chem.Mol,
                           history: Optional[BondHistory]) -> list[dict[int, int]]:
    """The ways the largest piece of `derived` that no step's bond joins (a toluene the arrows
    alkylated) sits in `written`, elements alike and bonds of any order, as written index ->
    derived index: none when no step made a bond of `derived`."""
    if history is None or not history.formed:
        return []
    made = {b.GetIdx() for b in derived.GetBonds()
            if pair(_origin(derived, b.GetBeginAtomIdx()), _origin(derived, b.GetEndAtomIdx())) in history.formed}
    if not made:
        return []
    # The connected pieces left when the bonds the steps made are taken away.
    owner = list(range(derived.GetNumAtoms()))

    def root(i: int) -> int:
        while owner[i] != i:
            owner[i] = owner[owner[i]]
            i = owner[i]
        return i

    for bond in derived.GetBonds():
        if bond.GetIdx() not in made:
            owner[root(bond.GetBeginAtomIdx())] = root(bond.GetEndAtomIdx())
    pieces: dict[int, list[int]] = {}
    for atom in atom_list(derived):
        if atom.GetAtomicNum() > 1:
            pieces.setdefault(root(atom.GetIdx()), []).append(atom.GetIdx())
    for piece in sorted(pieces.values(), key=len, reverse=True):
        if len(piece) < 2:
            break
        query = Chem.RWMol()
        at = {}
        for i in piece:
            at[i] = query.AddAtom(Chem.AtomFromSmarts(f"[#{derived.GetAtomWithIdx(i).GetAtomicNum()}]"))
        for bond in derived.GetBonds():
            i, j = bond.GetBeginAtomIdx(), bond.GetEndAtomIdx()
            if bond.GetIdx() not in made and i in at and j in at:
                query.AddBond(at[i], at[j], Chem.BondType.UNSPECIFIED)
                query.ReplaceBond(query.GetNumBonds() - 1, _ANY_BOND)
        matches = written.GetSubstructMatches(query, uniquify=False, useChirality=False, maxMatches=256)
        if matches:
            return [{w: piece[k] for k, w in enumerate(match)} for match in matches]
    return []


def _at_the_arrows(written: Chem.Mol, derived: Chem.Mol, align: dict[int, int],
                   history: Optional[BondHistory]) -> int:
    """How many of the differences under `align` are where the steps acted: a charge or a hydrogen
    count of an atom a step touched, a bond (on one side only, or of another order) between atoms
    whose bond a step made, broke or reordered."""
    if history is None or not history.atoms:
        return 0
    count = 0
    for wi, di in align.items():
        w, d = written.GetAtomWithIdx(wi), derived.GetAtomWithIdx(di)
        if _origin(derived, di) in history.atoms:
            count += (w.GetFormalCharge() != d.GetFormalCharge()) + (w.GetTotalNumHs() != d.GetTotalNumHs())
    back = {di: wi for wi, di in align.items()}
    differing = set()
    for bond in written.GetBonds():
        i, j = bond.GetBeginAtomIdx(), bond.GetEndAtomIdx()
        if i in align and j in align and _order(bond) != _order(derived.GetBondBetweenAtoms(align[i], align[j])):
            differing.add((align[i], align[j]))
    for bond in derived.GetBonds():
        i, j = bond.GetBeginAtomIdx(), bond.GetEndAtomIdx()
        if i in back and j in back and written.GetBondBetweenAtoms(back[i], back[j]) is None:
            differing.add((i, j))
    return count + sum(pair(_origin(derived, i), _origin(derived, j)) in history.touched for i, j in differing)


_ANY_BOND = Chem.BondFromSmarts("~")


def _common_part_placements(written: Chem.Mol, derived: Chem.Mol, with_hydrogens: bool) -> list[dict[int, int]]:
    """The ways a largest common part of the heavy atoms (alike in element, and in hydrogen count
    when `with_hydrogens`) sits in the two structures, as written index -> derived index; a
    symmetric part sits in `derived` several ways (acetone's enol on either methyl)."""
    from rdkit.Chem import rdFMCS   # only a mismatch is explained: spared on every clean check

    def labelled(mol: Chem.Mol, hydrogen_label: int) -> Chem.Mol:
        # The likeness is carried as an isotope label on a copy with the same atom indices. A
        # hydrogen written as an atom (a D) gets a label of its side alone, so that it never wins
        # a place in the common part over a heavy atom (the ketone's O, then called unmatched).
        work = Chem.Mol(mol)
        for atom in atom_list(work):
            z = atom.GetAtomicNum()
            likeness = (atom.GetTotalNumHs() + 1) if with_hydrogens else 0
            atom.SetIsotope(hydrogen_label if z == 1 else 10 * z + likeness)
        return work

    left_mol, right_mol = labelled(written, 1), labelled(derived, 2)
    result = rdFMCS.FindMCS([left_mol, right_mol], atomCompare=rdFMCS.AtomCompare.CompareIsotopes,
                            bondCompare=rdFMCS.BondCompare.CompareAny, ringMatchesRingOnly=False,
                            completeRingsOnly=False, matchValences=False, timeout=2)
    if not result.numAtoms:
        return []
    # The common part was found with bonds of any order, but its SMARTS keeps the orders it saw
    # (`-,=`): matched as written, it missed the part's other placements, a ring read the other
    # way round (a cyclopentenone's ring against its dienol's).
    query = Chem.RWMol(Chem.MolFromSmarts(result.smartsString))
    for bond in list(query.GetBonds()):
        query.ReplaceBond(bond.GetIdx(), _ANY_BOND)
    left = left_mol.GetSubstructMatch(query, useChirality=False)
    rights = right_mol.GetSubstructMatches(query, uniquify=False, useChirality=False, maxMatches=256)
    return [dict(zip(left, right)) for right in rights] if left else []


def _completed(written: Chem.Mol, derived: Chem.Mol, align: dict[int, int]) -> dict[int, int]:
    """`align` with the heavy atoms it leaves out paired too, when those are the same nuclides on
    both sides (a nitrile written where the moves made an isocyanide): one pair at a time, the one
    that adds the fewest differences to the pairs made. Otherwise `align` as it is: atoms of a
    formula that differs are counted, not paired."""
    paired = set(align.values())
    left_written = [a for a in atom_list(written) if a.GetAtomicNum() > 1 and a.GetIdx() not in align]
    left_derived = [a for a in atom_list(derived) if a.GetAtomicNum() > 1 and a.GetIdx() not in paired]
    if not left_written or Counter(map(_nuclide, left_written)) != Counter(map(_nuclide, left_derived)):
        return align
    align = dict(align)
    back = {di: wi for wi, di in align.items()}
    while left_written:
        w, d = min(((w, d) for w in left_written for d in left_derived if _nuclide(w) == _nuclide(d)),
                   key=lambda candidate: _added_differences(written, align, back, *candidate))
        align[w.GetIdx()], back[d.GetIdx()] = d.GetIdx(), w.GetIdx()
        left_written.remove(w)
        left_derived.remove(d)
    return align


def _added_differences(written: Chem.Mol, align: dict[int, int], back: dict[int, int],
                       w: Chem.Atom, d: Chem.Atom) -> int:
    """The differences pairing written atom `w` with derived atom `d` adds to `align` (`back`:
    its inverse): charge, hydrogens, and each bond to a paired atom that the other side lacks or
    holds with another order."""
    count = (w.GetFormalCharge() != d.GetFormalCharge()) + (w.GetTotalNumHs() != d.GetTotalNumHs())
    derived = d.GetOwningMol()
    for bond in w.GetBonds():
        other = bond.GetOtherAtomIdx(w.GetIdx())
        if other in align:
            count += _order(bond) != _order(derived.GetBondBetweenAtoms(d.GetIdx(), align[other]))
    for bond in d.GetBonds():
        other = bond.GetOtherAtomIdx(d.GetIdx())
        if other in back:
            count += written.GetBondBetweenAtoms(w.GetIdx(), back[other]) is None
    return count


def _differences(written: Chem.Mol, derived: Chem.Mol, align: dict[int, int]) -> int:
    """How many atoms (charge, hydrogens) and bonds differ between the two under `align`."""
    count = 0
    for wi, di in align.items():
        w, d = written.GetAtomWithIdx(wi), derived.GetAtomWithIdx(di)
        count += (w.GetFormalCharge() != d.GetFormalCharge()) + (w.GetTotalNumHs() != d.GetTotalNumHs())
    back = {di: wi for wi, di in align.items()}
    for bond in written.GetBonds():
        i, j = bond.GetBeginAtomIdx(), bond.GetEndAtomIdx()
        if i in align and j in align:
            count += _order(bond) != _order(derived.GetBondBetweenAtoms(align[i], align[j]))
    for bond in derived.GetBonds():
        i, j = bond.GetBeginAtomIdx(), bond.GetEndAtomIdx()
        if i in back and j in back:
            count += written.GetBondBetweenAtoms(back[i], back[j]) is None   # a bond only the moves made
    return count


def _signed(charge: int) -> str:
    return f"{charge:+d}" if charge else "0"


def _order(bond) -> int:
    if bond is None:
        return 0
    if bond.GetIsAromatic():
        return 15  # aromatic: compared as its own kind
    return int(bond.GetBondTypeAsDouble())


def _order_text(order: int) -> str:
    return "aromatic" if order == 15 else order_word(order)


def _nuclide(atom: Chem.Atom) -> str:
    """The atom's symbol with its label (rdkit_io.nuclide: D, 18O)."""
    return nuclide(atom.GetSymbol(), atom.GetIsotope())


_PROTON_HINT = "add a proton-transfer step, or move the checkpoint after it"


def _explain(frag: Fragment, closest: Fragment, state: ElectronState, what: str,
             history: Optional[BondHistory] = None) -> tuple[list[str], Optional[str]]:
    """What differs between a written piece and the derived piece closest to it, derived atoms
    named (C1, C(atom 7)), written ones by the derived atom they are paired with; and a hint when
    the difference points at one. `what`: "checkpoint" or "product"; `history`: the bonds the
    steps changed."""
    align = _alignment(frag.mol, closest.mol, history)
    if not align:
        return [], None

    def name(derived_index: int) -> str:
        return atom_label(state.mol, closest.mol.GetAtomWithIdx(derived_index).GetIntProp(_ORIGIN))

    details: list[str] = []
    hint = None
    for wi, di in align.items():
        w, d = frag.mol.GetAtomWithIdx(wi), closest.mol.GetAtomWithIdx(di)
        if w.GetFormalCharge() != d.GetFormalCharge():
            text = f"{name(di)}: expected charge {_signed(w.GetFormalCharge())}, the moves give {_signed(d.GetFormalCharge())}"
            if abs(w.GetTotalNumHs() - d.GetTotalNumHs()) == 1 and (
                    w.GetFormalCharge() - d.GetFormalCharge()) == (w.GetTotalNumHs() - d.GetTotalNumHs()):
                # One proton more or less says both differences at once.
                text += " (a proton transfer is missing?)"
                hint = _PROTON_HINT
            elif w.GetTotalNumHs() != d.GetTotalNumHs():
                # Any other hydrogen difference is told with the charge: an arenium written as the
                # neutral cyclohexadiene differs at its CH2 by a hydride, not by the charge alone.
                text = (f"{name(di)}: expected charge {_signed(w.GetFormalCharge())} and {w.GetTotalNumHs()} H, "
                        f"the moves give {_signed(d.GetFormalCharge())} and {d.GetTotalNumHs()} H")
            details.append(text)
        elif w.GetTotalNumHs() != d.GetTotalNumHs():
            details.append(f"{name(di)}: expected {w.GetTotalNumHs()} H, the moves give {d.GetTotalNumHs()}")
        if w.GetIsotope() != d.GetIsotope():
            details.append(f"{name(di)}: expected {_nuclide(w)}, the moves give {_nuclide(d)}")
        # Unpaired electrons as the moves leave them, on the state's own Mol: the derived piece
        # was sanitized again, and RDKit then gives a bare [N+] with two bonds (a nitrenium ion
        # with its lone pair) two unpaired electrons. A SMILES cannot tell that lone pair from two
        # unpaired electrons either, so only an odd count against an even one is a difference.
        written_unpaired = w.GetNumRadicalElectrons() % 2
        derived_unpaired = state.mol.GetAtomWithIdx(d.GetIntProp(_ORIGIN)).GetNumRadicalElectrons() % 2
        if written_unpaired != derived_unpaired:
            details.append(f"{name(di)}: expected {written_unpaired} unpaired electron(s), "
                           f"the moves give {derived_unpaired}")
    written_atoms = sorted(align)
    for x, wi in enumerate(written_atoms):
        for wj in written_atoms[x + 1:]:
            expected = _order(frag.mol.GetBondBetweenAtoms(wi, wj))
            given = _order(closest.mol.GetBondBetweenAtoms(align[wi], align[wj]))
            if expected != given and expected and given:   # a bond on one side only: _rebonded's
                details.append(f"bond {name(align[wi])}-{name(align[wj])}: expected {_order_text(expected)}, "
                               f"the moves give {_order_text(given)}")
    made = None if history is None else (
        lambda i, j: pair(_origin(closest.mol, i), _origin(closest.mol, j)) in history.formed)
    details[:0] = _rebonded(frag.mol, closest.mol, align, name, what, made)
    # Aligned by map numbers, only the numbered atoms are paired: the others are not unmatched.
    by_maps = any(frag.mol.GetAtomWithIdx(i).GetAtomMapNum() for i in align)
    counted = (lambda atom: atom.GetAtomMapNum() != 0) if by_maps else (lambda atom: True)
    unmatched = Counter(_nuclide(atom) for i, atom in enumerate(frag.mol.GetAtoms()) if i not in align and counted(atom))
    if unmatched:
        details.append("written atoms with no counterpart: " + ", ".join(f"{n} {el}" for el, n in sorted(unmatched.items())))
    paired = set(align.values())
    extra = Counter(_nuclide(atom) for i, atom in enumerate(closest.mol.GetAtoms()) if i not in paired and counted(atom))
    if extra:
        details.append("derived atoms not written: " + ", ".join(f"{n} {el}" for el, n in sorted(extra.items())))
    return details[:8], hint


def _rebonded(written: Chem.Mol, derived: Chem.Mol, align: dict[int, int], name: Callable[[int], str],
              what: str, made: Optional[Callable[[int, int], bool]] = None) -> list[str]:
    """The bonds between paired atoms that one side has and the other lacks, in words. A bond the
    moves make from an atom where the written structure bonds that atom to another is one change:
    "the moves bond C1 to N7; the checkpoint bonds C1 to C6 instead" (a nitrile written where
    the moves made an isocyanide). A derived bond no step made (`made`, by derived indices, when
    known) was in a species as written: "in the derived state C6 is bonded to C5"."""
    back = {di: wi for wi, di in align.items()}
    only_derived = [(b.GetBeginAtomIdx(), b.GetEndAtomIdx(), _order(b)) for b in derived.GetBonds()
                    if b.GetBeginAtomIdx() in back and b.GetEndAtomIdx() in back
                    and written.GetBondBetweenAtoms(back[b.GetBeginAtomIdx()], back[b.GetEndAtomIdx()]) is None]
    only_written = [(align[b.GetBeginAtomIdx()], align[b.GetEndAtomIdx()], _order(b)) for b in written.GetBonds()
                    if b.GetBeginAtomIdx() in align and b.GetEndAtomIdx() in align
                    and derived.GetBondBetweenAtoms(align[b.GetBeginAtomIdx()], align[b.GetEndAtomIdx()]) is None]

    def to(atom: int, order: int) -> str:
        return name(atom) + ("" if order == 1 else f" by {'an' if order == 15 else 'a'} {_order_text(order)} bond")

    def derived_bond(i: int, j: int, order: int) -> str:
        if made is None or made(i, j):
            return f"the moves bond {name(i)} to {to(j, order)}"
        return f"in the derived state {name(i)} is bonded to {to(j, order)}"

    lines = []
    for i, j, order in only_derived:
        instead = next(((x, y, o) for x, y, o in only_written if {x, y} & {i, j}), None)
        if instead is None:
            lines.append(f"{derived_bond(i, j, order)}, the {what} does not")
            continue
        only_written.remove(instead)
        x, y, written_order = instead
        shared, derived_end = (i, j) if i in (x, y) else (j, i)
        written_end = y if x == shared else x
        lines.append(f"{derived_bond(shared, derived_end, order)}; "
                     f"the {what} bonds {name(shared)} to {to(written_end, written_order)} instead")
    lines += [f"the {what} bonds {name(x)} to {to(y, order)}, the moves do not" for x, y, order in only_written]
    return lines


class CheckpointsMatch(Check):
    name = "checkpoints match"
    codes = ("AR401", "AR402")

    def __init__(self) -> None:
        # A structure written twice (the last checkpoint, then the same product) is read once.
        self.read: dict[str, tuple[Optional[list[Fragment]], str, frozenset[int], Optional[int]]] = {}
        self.history = BondHistory()   # what the steps did to the bonds, to word a mismatch

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.after is not None:
            self.history.add(st.change)
            for checkpoint in st.step.expects:
                yield from compare(st.after, checkpoint, "AR401", st.index, context.views, self.read, self.history)

    def finish(self, end: Ending, context) -> Iterator[Diagnostic]:
        product = end.mechanism.product
        if product is not None and end.final is not None:
            yield from compare(end.final, product, "AR402", None, context.views, self.read, self.history)
