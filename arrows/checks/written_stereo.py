"""A checkpoint or the product written with a configuration (@, @@, / or \\) other than the one
the steps give (AR603). The constitution is CheckpointsMatch's to judge: here only a written piece
and a derived piece of one constitution are compared, and only when the derived piece is
configured at as many elements as the written one (the steps configure few centres; of the others
nothing is said). An enantiomer of a product that forms as the racemate is no mismatch; a
configuration written at a centre the steps cleared, with no chiral species left to pass one on,
is (the product forms as the racemate there, not as the one written)."""
from __future__ import annotations

from typing import Iterator, Mapping, NamedTuple, Optional

from rdkit import Chem

from ..diagnostics import Diagnostic
from ..configuration import neighbours_round, tag_kept
from ..electrons import ElectronState
from ..judgement.stereo import DIASTEREOMERS, ENANTIOMERS, cip_codes, is_chiral, relation
from ..model import Checkpoint
from ..rdkit_io import fragment, potential_stereo
from ..trace import StepTrace
from . import Check, Ending
from .checkpoints import _ORIGIN, fragments

_MARKS = ("@", "/", "\\")


class _Piece(NamedTuple):
    smiles: str        # with its configuration
    configured: int    # configured stereo elements
    atoms: int


def _pieces(mol: Chem.Mol, wanted: Optional[dict[str, _Piece]] = None) -> dict[str, _Piece]:
    """Per constitution (SMILES without configuration): the piece's SMILES with its configuration
    and the number of its configured stereo elements (map numbers and hydrogen atoms dropped, as
    the checkpoint comparison prepares them). With `wanted`, the written pieces, only the pieces
    of a written size and constitution are read (a piece of equal constitution has as many atoms):
    the others are never compared."""
    sizes = None if wanted is None else {piece.atoms for piece in wanted.values()}
    out = {}
    for piece in fragments(mol, lazy=True):
        atoms = piece.mol.GetNumAtoms()
        if sizes is not None and atoms not in sizes:
            continue
        smiles = piece.smiles
        configured = sum(info.specified == Chem.StereoSpecified.Specified
                         for info in potential_stereo(piece.mol, clean=False))
        constitution = Chem.MolToSmiles(piece.mol, isomericSmiles=False)
        if wanted is None or constitution in wanted:
            out[constitution] = _Piece(smiles, configured, atoms)
    return out


def holds_chirality(state: ElectronState) -> bool:
    """Whether some molecule of `state` differs from its mirror image (RDKit canonical SMILES of
    both): a meso compound, or one with no configured centre, does not."""
    if not state.configured:
        return False
    mol = state.mol
    for indices in Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False):
        # Only a piece with a configured centre can be chiral here (an allene or a biaryl written
        # so is not in the bookkeeping): the others are not cut out.
        if all(mol.GetAtomWithIdx(i).GetChiralTag() == Chem.ChiralType.CHI_UNSPECIFIED for i in indices):
            continue
        piece = fragment(mol, indices)
        for atom in piece.GetAtoms():
            atom.SetAtomMapNum(0)   # (numbered, a meso compound's two centres would differ)
        if is_chiral(Chem.MolToSmiles(piece)):
            return True
    return False


def _paired(mol: Chem.Mol, written_smiles: str, constitution: str):
    """(the written piece, the piece of `mol` of that constitution, each written atom's partner in
    it), or None when RDKit reads neither or pairs no atoms."""
    written = Chem.MolFromSmiles(written_smiles)
    derived = next((piece.mol for piece in fragments(mol, origins=True)
                    if Chem.MolToSmiles(piece.mol, isomericSmiles=False) == constitution), None)
    if written is None or derived is None:
        return None
    bare = Chem.Mol(written)
    Chem.RemoveStereochemistry(bare)
    pairing = derived.GetSubstructMatch(bare)
    if len(pairing) != written.GetNumAtoms():
        return None
    return written, derived, pairing


def _labels_that_differ(state: ElectronState, written_smiles: str, constitution: str) -> str:
    """Where the written piece and the derived one differ, by CIP label (RDKit's), the centres
    and double bonds named as the state names them: "C1 written (R), the steps give (S)"; empty
    when RDKit labels neither or pairs no atoms."""
    paired = _paired(state.mol, written_smiles, constitution)
    if paired is None:
        return ""
    written, derived, pairing = paired
    mine, theirs = cip_codes(written), cip_codes(derived)
    origin = lambda k: derived.GetAtomWithIdx(k).GetIntProp(_ORIGIN)
    told = []
    for w, d in enumerate(pairing):
        if ("atom", w) in mine and mine[("atom", w)] != theirs.get(("atom", d)):
            told.append(f"{state.label(origin(d))} written ({mine[('atom', w)]}), the steps give "
                        f"({theirs.get(('atom', d), 'no label')})")
    for bond in written.GetBonds():
        key = ("bond", bond.GetBeginAtomIdx(), bond.GetEndAtomIdx())
        if key not in mine:
            continue
        a, b = pairing[bond.GetBeginAtomIdx()], pairing[bond.GetEndAtomIdx()]
        given = theirs.get(("bond", a, b)) or theirs.get(("bond", b, a))
        if given != mine[key]:
            first, second = sorted((origin(a), origin(b)))   # (named as AR602 names it: C1=C2)
            told.append(f"{state.label(first)}={state.label(second)} written {mine[key]}, "
                        f"the steps give {given or 'no geometry'}")
    return "; ".join(told)


class Cleared(NamedTuple):
    step: int                  # the step that cleared it (0-based)
    tag: Chem.ChiralType       # its chiral tag before that step, read against
    around: list[int]          # its neighbours then (configuration.neighbours_round)


class ClearedCentres:
    """The centres whose configuration a step cleared and no later step set again (an
    enolisation, an SN1's cation, an oxazolone's aromatic anion), each with what it was."""

    def __init__(self) -> None:
        self.centres: dict[int, Cleared] = {}

    def after(self, st: StepTrace) -> None:
        if st.after is None or not (st.before.configured or self.centres):
            return
        before, after = st.before.mol, st.after.mol
        for i in st.change.touched_atoms:
            if i >= after.GetNumAtoms() or i >= before.GetNumAtoms():
                continue
            tag = before.GetAtomWithIdx(i).GetChiralTag()
            if after.GetAtomWithIdx(i).GetChiralTag() != Chem.ChiralType.CHI_UNSPECIFIED:
                self.centres.pop(i, None)
            elif tag != Chem.ChiralType.CHI_UNSPECIFIED:
                self.centres[i] = Cleared(st.index, tag, neighbours_round(before, i))


def _written_as_kept(state: ElectronState, written_smiles: str, constitution: str,
                     cleared: Mapping[int, Cleared]) -> list[str]:
    """The written piece's centres that a step cleared, the state leaves unconfigured, and the
    written piece gives the configuration they had before (a claim of retention):
    "C2 written (S), as it was before step 1, but the steps racemise C2 (...)". A centre written the
    other way (a racemase's turnover, its chiral site left out) or whose neighbours changed (an
    SN1's new nucleophile: ion pairs can favour inversion) is not judged."""
    paired = _paired(state.mol, written_smiles, constitution)
    if paired is None:
        return []
    written, derived, pairing = paired
    told = []
    for key, code in cip_codes(written).items():
        if key[0] != "atom":
            continue
        atom = derived.GetAtomWithIdx(pairing[key[1]]).GetIntProp(_ORIGIN)
        if atom not in cleared or state.mol.GetAtomWithIdx(atom).GetChiralTag() != Chem.ChiralType.CHI_UNSPECIFIED:
            continue
        was = cleared[atom]
        kept = tag_kept(was.tag, was.around, state.mol, atom)
        if kept is None:
            continue
        work = Chem.Mol(state.mol)
        work.GetAtomWithIdx(atom).SetChiralTag(kept)
        as_kept = _paired(work, written_smiles, constitution)
        if as_kept is not None and cip_codes(as_kept[1]).get(("atom", as_kept[2][key[1]])) == code:
            name = state.label(atom)
            told.append(f"{name} written ({code}), as it was before step {was.step + 1}, but the steps racemise "
                        f"{name} (cleared at step {was.step + 1}, set by no later step)")
    return told


class ChiralityWatch:
    """Whether the states so far leave a chiral product as the racemate: so until a species
    brings in a chiral molecule, and again once a state holds no chiral molecule (a meso
    epoxide opened by azide; a threo bromohydrin through its meso bromonium ion; an alkene
    made from a meso dibromide): what the steps configure after that is formed with its mirror
    image (common practice: no chiral reagent, no enantiomeric excess)."""

    def __init__(self) -> None:
        self.racemic = True

    def before(self, st: StepTrace) -> None:
        # The species written so far: the whole starting state, then those a step brings in.
        newcomers = range(st.before.mol.GetNumAtoms()) if st.index == 0 else st.entered
        atom = st.before.mol.GetAtomWithIdx
        if self.racemic and st.before.configured and any(
                atom(i).GetChiralTag() != Chem.ChiralType.CHI_UNSPECIFIED for i in newcomers):
            self.racemic = not holds_chirality(st.before)

    def after(self, st: StepTrace) -> None:
        if not self.racemic and st.after is not None and not holds_chirality(st.after):
            self.racemic = True


def forms_racemate(trace) -> bool:
    """ChiralityWatch's verdict at the end of a replayed mechanism."""
    watch = ChiralityWatch()
    for st in trace.steps:
        watch.before(st)
        watch.after(st)
    return watch.racemic


def mismatches(state: ElectronState, checkpoint: Checkpoint, what: str, step: Optional[int],
               racemic: bool, cleared: Optional[Mapping[int, Cleared]] = None) -> list[Diagnostic]:
    """AR603 for each written piece of `checkpoint` configured otherwise than `state` has it, or
    configured as before at a centre the steps racemised (`cleared`, ClearedCentres')."""
    if not any(mark in checkpoint.smiles for mark in _MARKS):
        return []
    written_mol = Chem.MolFromSmiles(checkpoint.smiles)
    if written_mol is None:
        return []   # unreadable: CheckpointsMatch says so
    try:
        written = _pieces(written_mol)
        derived = _pieces(state.mol, written)
    except Exception:   # an intermediate RDKit will not perceive says nothing either way
        return []
    found = []
    for constitution, (smiles, configured, _) in written.items():
        if not configured or constitution not in derived:
            continue
        derived_smiles, derived_configured, _ = derived[constitution]
        if derived_configured < configured and racemic and cleared:
            # Fewer configured elements are most often centres no rule configures (an aldol's),
            # of which nothing is said; but one a step cleared, in a state left with no chiral
            # molecule, can only form as the racemate (common practice: no chiral reagent, no
            # enantiomeric excess; an enolate's or oxazolone's reprotonation racemises).
            racemised = _written_as_kept(state, smiles, constitution, cleared)
            if racemised:
                found.append(Diagnostic(
                    "AR603", f"the {what} is written {smiles}: {'; '.join(racemised)}, and no chiral "
                    "species is left to pass a configuration on: it forms as the racemate",
                    checkpoint.loc, step=step,
                    hint="write it without that configuration (the racemate); where the configuration is "
                         "kept, the step that clears it is wrong, or the chiral species that sets it again "
                         "is left out (`arrows trace --stereo` lists what each step configures)"))
            continue
        if derived_configured != configured or derived_smiles == smiles:
            continue   # (one canonical SMILES: the same stereoisomer, which relation() would read twice to say)
        kind = relation(smiles, derived_smiles)
        if kind == DIASTEREOMERS or (kind == ENANTIOMERS and not racemic):
            differ = _labels_that_differ(state, smiles, constitution)
            hint = ("write the configuration the steps give, or check the configured species and the "
                    "stereospecific steps (`arrows trace --stereo` lists what each step configures)")
            if racemic and is_chiral(derived_smiles):
                hint += "; the steps give it as the racemate: either enantiomer of it may be written"
            found.append(Diagnostic(
                "AR603", f"the {what} is written {smiles}, but the steps give {derived_smiles} ({kind}"
                f"{': ' + differ if differ else ''})",
                checkpoint.loc, step=step, hint=hint))
    return found


class WrittenConfigurationMatches(Check):
    name = "written configuration"
    codes = ("AR603",)

    def __init__(self) -> None:
        self.watch = ChiralityWatch()
        self.cleared = ClearedCentres()

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.index == 0:
            self.watch = ChiralityWatch()
            self.cleared = ClearedCentres()
        self.watch.before(st)
        if st.after is None:
            return
        self.watch.after(st)
        self.cleared.after(st)
        for checkpoint in st.step.expects:
            yield from mismatches(st.after, checkpoint, "checkpoint", st.index, self.watch.racemic,
                                  self.cleared.centres)

    def finish(self, end: Ending, context) -> Iterator[Diagnostic]:
        product = end.mechanism.product
        if product is not None and end.final is not None:
            yield from mismatches(end.final, product, "product", None, self.watch.racemic, self.cleared.centres)
