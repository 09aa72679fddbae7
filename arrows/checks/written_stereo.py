"""A checkpoint or the product written with a configuration (@, @@, / or \\) other than the one
the steps give (AR603). The constitution is CheckpointsMatch's to judge: here only a written piece
and a derived piece of one constitution are compared, element by element: a centre or double
bond the steps leave unset is not judged (the steps configure few; of the others nothing is said),
and final_state_as_written gives it the written configuration for the product panel. An enantiomer of a product that forms as the racemate is no mismatch; a
configuration written at a centre the steps cleared, with no chiral species left to pass one on,
is (the product forms as the racemate there, not as the one written)."""
from __future__ import annotations

from dataclasses import replace
from itertools import product
from typing import Iterator, Mapping, NamedTuple, Optional

from rdkit import Chem

from ..diagnostics import Diagnostic
from ..configuration import (fill_in_configuration, forget_configuration_of_bond, neighbours_round, open_face_groups,
                             tag_kept, turned_over, without_chair_configuration)
from ..electrons import ElectronState
from ..judgement.stereo import DIASTEREOMERS, ENANTIOMERS, IDENTICAL, _mirror, cip_codes, is_chiral, relation
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


def _completed(derived: Chem.Mol, written: Chem.Mol, pairing: tuple[int, ...], mirrored: bool = False) -> Chem.Mol:
    """The derived piece (or its mirror image) configured as written where the steps leave an
    element unset, and unset where the written piece leaves one: configured at the written
    elements only, so that a difference is one the steps make."""
    work = Chem.RWMol(_mirror(derived) if mirrored else derived)
    written_at = {d: w for w, d in enumerate(pairing)}
    for atom in work.GetAtoms():
        w = written_at.get(atom.GetIdx())
        if w is not None and written.GetAtomWithIdx(w).GetChiralTag() == Chem.ChiralType.CHI_UNSPECIFIED:
            atom.SetChiralTag(Chem.ChiralType.CHI_UNSPECIFIED)
    for bond in work.GetBonds():
        if bond.GetStereo() == Chem.BondStereo.STEREONONE:
            continue
        a, b = written_at.get(bond.GetBeginAtomIdx()), written_at.get(bond.GetEndAtomIdx())
        mine = None if a is None or b is None else written.GetBondBetweenAtoms(a, b)
        if mine is None or mine.GetStereo() == Chem.BondStereo.STEREONONE:
            forget_configuration_of_bond(bond)
    fill_in_configuration(work, written, pairing)
    return work.GetMol()


def _labels_that_differ(state: ElectronState, written: Chem.Mol, derived: Chem.Mol, pairing: tuple[int, ...]) -> str:
    """Where the written piece and the derived one (paired by `pairing`) differ, by CIP label
    (RDKit's), the centres and double bonds named as the state names them: "C1 written (R), the
    steps give (S)"; empty when RDKit labels neither."""
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
    cation: bool = False       # left a planar cation (an SN1's carbocation)


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
                self.centres[i] = Cleared(st.index, tag, neighbours_round(before, i), _planar_cation(after, i))


def _planar_cation(mol: Chem.Mol, atom: int) -> bool:
    """Whether `atom` is a carbocation with three bonds (trigonal, planar: either face open)."""
    centre = mol.GetAtomWithIdx(atom)
    try:
        bonds = centre.GetDegree() + centre.GetTotalNumHs()
    except RuntimeError:   # hydrogens not counted: not read
        return False
    return centre.GetAtomicNum() == 6 and centre.GetFormalCharge() == 1 and bonds == 3


def _written_as_kept(state: ElectronState, written_smiles: str, constitution: str,
                     cleared: Mapping[int, Cleared]) -> list[str]:
    """The written piece's centres that a step cleared, the state leaves unconfigured, and the
    written piece gives the configuration they had before (a claim of retention):
    "C2 written (S), as it was before step 1, but the steps racemise C2 (...)". A centre cleared as a
    planar cation (an SN1) whose leaving group a nucleophile replaced is read with the nucleophile
    in the leaving group's place: retention through a free carbocation is the same claim (common
    practice: the cation is captured on both faces). A centre written the other way (a racemase's
    turnover, its chiral site left out; an SN1 written with inversion, which an ion pair can
    favour) or whose neighbours changed otherwise is not judged."""
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
        kept = tag_kept(was.tag, _in_place(was, neighbours_round(state.mol, atom)), state.mol, atom)
        if kept is None:
            continue
        work = Chem.Mol(state.mol)
        work.GetAtomWithIdx(atom).SetChiralTag(kept)
        as_kept = _paired(work, written_smiles, constitution)
        if as_kept is not None and cip_codes(as_kept[1]).get(("atom", as_kept[2][key[1]])) == code:
            name = state.label(atom)
            how = "a planar cation made" if was.cation else "cleared"
            told.append(f"{name} written ({code}), as it was before step {was.step + 1}, but the steps racemise "
                        f"{name} ({how} at step {was.step + 1}, set by no later step)")
    return told


def _in_place(was: Cleared, now: list[int]) -> list[int]:
    """The neighbours a cleared centre had, with the one new neighbour in place of the one gone
    when it was a planar cation (the nucleophile that captured it for the leaving group)."""
    gone = [n for n in was.around if n not in now]
    new = [n for n in now if n not in was.around]
    if not was.cation or len(gone) != 1 or len(new) != 1 or -1 in gone + new:
        return was.around
    return [new[0] if n == gone[0] else n for n in was.around]


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
        if not self.racemic and st.after is not None and not self.holds_chirality(st.after):
            self.racemic = True

    def holds_chirality(self, state: ElectronState) -> bool:
        """Whether `state` leads on to a chiral product (a check that knows more may say so where
        the state's bookkeeping does not)."""
        return holds_chirality(state)


def mismatches(state: ElectronState, checkpoint: Checkpoint, what: str, step: Optional[int],
               racemic: bool, cleared: Optional[Mapping[int, Cleared]] = None) -> list[Diagnostic]:
    """AR603 for each written piece of `checkpoint` configured otherwise than `state` has it, or
    configured as before at a centre the steps racemised (`cleared`, ClearedCentres'). A pair of
    centres the steps fix only relative to each other (a Diels-Alder diene's ends: endo or exo is
    open) may be written either way round: none is told when one of those arrangements fits."""
    if not any(mark in checkpoint.smiles for mark in _MARKS):
        return []
    found = _mismatches(state, checkpoint, what, step, racemic, cleared)
    if found and any(not _mismatches(variant, checkpoint, what, step, racemic, cleared)
                     for variant in _turned_variants(state)):
        return []
    if found and _chair_alone(state, checkpoint, what, step, racemic, cleared):
        return []   # AR605's: it names the chair
    return found


def _chair_alone(state: ElectronState, checkpoint: Checkpoint, what: str, step: Optional[int], racemic: bool,
                 cleared: Optional[Mapping[int, Cleared]]) -> bool:
    """Whether the written configuration differs from the state's only where a [3,3] shift's chair
    set it (the state without that configuration shows no mismatch)."""
    bare = without_chair_configuration(state.mol)
    return bare is not None and not _mismatches(replace(state, mol=bare, judged={}), checkpoint, what, step,
                                                racemic, cleared)


def _turned_variants(state: ElectronState) -> Iterator[ElectronState]:
    """The state with each nonempty choice of its open_face_groups inverted."""
    groups = open_face_groups(state.mol)
    for choice in product((False, True), repeat=len(groups)):
        if any(choice):
            atoms = [i for group, turn in zip(groups, choice) if turn for i in group]
            yield replace(state, mol=turned_over(state.mol, atoms), judged={})


_COMPARED = "written pieces"   # the key of compared_pieces's comparison among a state's judgements


def compared_pieces(state: ElectronState, smiles: str) -> Optional[tuple[dict[str, _Piece], dict[str, _Piece]]]:
    """_pieces_compared, kept with the state (judged): the drawing of the product panel starts
    from the check's comparison of the product (final_state_as_written)."""
    state.judged[(_COMPARED, smiles)] = found = _pieces_compared(state, smiles)
    return found


def _pieces_compared(state: ElectronState, smiles: str) -> Optional[tuple[dict[str, _Piece], dict[str, _Piece]]]:
    """The written pieces of `smiles` and the pieces of `state` of their constitutions (_pieces);
    None when RDKit cannot read the SMILES (CheckpointsMatch says so) or will not perceive the
    state (an intermediate says nothing either way)."""
    written_mol = Chem.MolFromSmiles(smiles)
    if written_mol is None:
        return None
    try:
        written = _pieces(written_mol)
        return written, _pieces(state.mol, written)
    except Exception:
        return None


def _mismatches(state: ElectronState, checkpoint: Checkpoint, what: str, step: Optional[int],
                racemic: bool, cleared: Optional[Mapping[int, Cleared]],
                compared: Optional[tuple[dict[str, _Piece], dict[str, _Piece]]] = None) -> list[Diagnostic]:
    """`compared`: compared_pieces(state, checkpoint.smiles), when the caller has it already."""
    if compared is None:
        compared = compared_pieces(state, checkpoint.smiles)
        if compared is None:
            return []
    written, derived = compared
    found = []
    for constitution, (smiles, configured, _) in written.items():
        if not configured or constitution not in derived:
            continue
        derived_smiles, derived_configured, _ = derived[constitution]
        if derived_smiles == smiles:
            continue   # (one canonical SMILES: the same stereoisomer)
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
        # Element by element: each stereo element written and configured by the steps is compared;
        # one the steps leave unset (an aldol's centre, a Felkin addition's) takes the written
        # configuration, and one the author leaves unset is not compared.
        paired = _paired(state.mol, smiles, constitution)
        if paired is None:
            continue
        written_piece, derived_piece, pairing = paired
        completed = _completed(derived_piece, written_piece, pairing)
        kind = relation(smiles, Chem.MolToSmiles(completed))
        if kind == ENANTIOMERS and racemic:
            continue
        if kind == DIASTEREOMERS and racemic and derived_configured < configured:
            # The racemate's other enantiomer, completed as written, may be the one written.
            if relation(smiles, Chem.MolToSmiles(_completed(derived_piece, written_piece, pairing, True))) \
                    in (IDENTICAL, ENANTIOMERS):
                continue
        if kind not in (DIASTEREOMERS, ENANTIOMERS):
            continue
        differ = _labels_that_differ(state, written_piece, completed, pairing)
        hint = ("write the configuration the steps give, or check the configured species and the "
                "stereospecific steps (`arrows trace --stereo` lists what each step configures)")
        if racemic and is_chiral(derived_smiles):
            hint += "; the steps give it as the racemate: either enantiomer of it may be written"
        # With elements the steps leave unset, the derived piece is no stereoisomer of the written
        # one: only the elements that differ are named.
        told = [kind] if derived_configured >= configured else []
        found.append(Diagnostic(
            "AR603", f"the {what} is written {smiles}, but the steps give {derived_smiles} "
            f"({': '.join(told + ([differ] if differ else [])) or kind})",
            checkpoint.loc, step=step, hint=hint))
    return found


def _configured_otherwise(written: dict[str, _Piece], derived: dict[str, _Piece]) -> list[tuple[str, str]]:
    """(constitution, written SMILES) of each configured written piece whose derived piece
    (`compared_pieces`'s) has other SMILES: configured otherwise, or left unset by the steps."""
    return [(constitution, piece.smiles) for constitution, piece in written.items()
            if piece.configured and constitution in derived and derived[constitution].smiles != piece.smiles]


def final_state_as_written(trace) -> Optional[ElectronState]:
    """The last state of a replayed mechanism configured as its `product` is written where the
    steps leave a centre or double bond unset (a conrotatory ring opening's Z alkene, a Felkin
    addition's new centre: outcomes the bookkeeping does not derive), and in the arrangement it
    writes of the pairs the steps leave open (endo or exo),
    for the product panel to draw. Only when the written configuration agrees with every element
    the steps do configure (no AR603); a racemate's pieces take the written relative
    configuration, the steps' own centres kept. None when nothing is added."""
    product = trace.mechanism.product
    final = trace.steps[-1].after if trace.steps else None
    if product is None or final is None or not any(mark in product.smiles for mark in _MARKS):
        return None
    # mismatches() unrolled, so each arrangement is compared once, and its pieces are kept for the
    # filling in below; the check's comparison of the product is taken when it made one (a drawing
    # keeps none of its own)
    compared = final.judged.get((_COMPARED, product.smiles)) or _pieces_compared(final, product.smiles)
    if compared is None:
        return None   # unreadable, or a state RDKit will not perceive: drawn as the steps leave it
    if not _configured_otherwise(*compared):
        return None   # every piece as written: neither mismatched nor left to fill in
    watch, cleared = ChiralityWatch(), ClearedCentres()
    for st in trace.steps:
        watch.before(st)
        watch.after(st)
        cleared.after(st)
    turned = bool(_mismatches(final, product, "product", None, watch.racemic, cleared.centres, compared))
    if turned:
        # endo or exo, as written: the arrangement of the open pairs that fits it
        for variant in _turned_variants(final):
            compared = _pieces_compared(variant, product.smiles)
            if compared is None:
                return None
            if not _mismatches(variant, product, "product", None, watch.racemic, cleared.centres, compared):
                final = variant
                break
        else:
            return None   # no arrangement fits: AR603
    work = Chem.RWMol(final.mol)
    changed = False
    for constitution, smiles in _configured_otherwise(*compared):
        paired = _paired(final.mol, smiles, constitution)
        if paired is None:
            continue
        written_piece, derived_piece, pairing = paired
        if watch.racemic and relation(smiles, Chem.MolToSmiles(_completed(derived_piece, written_piece, pairing))) \
                not in (IDENTICAL, ENANTIOMERS):
            written_piece = _mirror(written_piece)   # the enantiomer that fits the steps' centres
        origins = [derived_piece.GetAtomWithIdx(d).GetIntProp(_ORIGIN) for d in pairing]
        changed |= fill_in_configuration(work, written_piece, origins)
    if not changed and not turned:
        return None
    return replace(final, mol=work.GetMol(), configured=True, judged={})


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
