"""Diagnostics are data: a code from the table below, a severity, a location, the atoms and
bonds involved, and a hint. Only the CLI turns them into text."""
from __future__ import annotations

from dataclasses import field
from typing import Iterable, Optional

from .model import Location, frozen

ERROR, WARNING, NOTE = "error", "warning", "note"
SEVERITY_RANK = {ERROR: 0, WARNING: 1, NOTE: 2}


@frozen
class Code:
    code: str
    severity: str
    title: str
    explanation: str
    example: str = ""


def _table(*codes: Code) -> dict[str, Code]:
    return {c.code: c for c in codes}


# Stable codes. Families: AR1xx reading the file, AR2xx electron moves, AR3xx the derived
# structures, AR4xx conservation and checkpoints, AR5xx chemical judgement, AR6xx notes.
CODES = _table(
    Code("AR100", ERROR, "cannot read file",
         "The file could not be read or is not UTF-8 text.",
         'arrows check scheme.cdx   # a binary drawing file, not mechanism text'),
    Code("AR101", ERROR, "syntax error",
         "The text does not follow the mechanism language.",
         'step "deprotonation"\n    :O11 -> H(C3)\n    C3-H -> C2=C3\n# missing `end`'),
    Code("AR102", ERROR, "SMILES not understood",
         "RDKit could not read the SMILES of a species, checkpoint or product. RDKit's reason is given "
         "in the author's terms: an atom over its valence is named as written ([C-], atom 3 as written), "
         "the error located at it.",
         'species dione = "CC(=O)CC(C"   # unclosed branch'),
    Code("AR103", ERROR, "map number used twice",
         "Every atom map number must be unique across the whole mechanism, so that a move names one atom.",
         'species a = "[CH3:1][OH:2]"\nspecies b = "[OH2:2]"'),
    Code("AR104", ERROR, "unknown atom",
         "A move names a map number that no species declares.",
         'species w = "[OH2:1]"\nstep "s"\n    :O7 -> H(O1)\nend'),
    Code("AR105", ERROR, "element does not match",
         "The element written with a map number differs from the element of that atom in the SMILES.",
         'species acetone = "[CH3:1][C:2](=[O:3])C"\n...\n    C3=O2 -> O3   # C3 is oxygen, C2 is carbon'),
    Code("AR106", ERROR, "atom already released",
         "A move or checkpoint uses an atom whose fragment left the drawing with `releases` in an earlier step.",
         'step "loss of water" releases O9 ... end\nstep "next"\n    :O9 -> C2\nend'),
    Code("AR107", ERROR, "statement after the product",
         "`product` closes the mechanism: no step or second product may follow it.",
         'product "CC(=O)CC"\nstep "one more"   # after the product\n    ...\nend'),
    Code("AR108", ERROR, "duplicate species name",
         "Two species (or `uses` entries) share one name.",
         'species water = "[OH2:1]"\nspecies water = "[OH2:2]"   # name the second water_2'),
    Code("AR109", ERROR, "no such hydrogen",
         "`H(X)` or `X-H` names a hydrogen on X, but X carries none at that point. A hydrogen that moves "
         "with its pair or electron keeps the name of the atom it leaves (`C1-H -> O4-H(C1)`), as the hint "
         "writes when the sink's `X-H` was meant for it.",
         'species ion = "[O-:1]C"\nstep "s"\n    O1-H -> O1\nend'),
    Code("AR110", ERROR, "data-set record is not JSON",
         "A line of a JSONL data set (`arrows check --jsonl`) is not UTF-8 JSON text, or not a JSON object.",
         '{"id": "r1", "text": "species w = ..."   # the closing brace is missing'),
    Code("AR111", ERROR, "data-set record does not follow the schema",
         "A JSONL record lacks a field or gives one of the wrong type; arrows/jsonl-input.schema.json "
         "describes the record.",
         '{"id": "r2", "steps": []}   # neither "text" nor "species" is given'),
    Code("AR112", ERROR, "nothing to check",
         "The file holds no species and no steps: it is empty, or comments only.",
         'species water = "[OH2:1]"\nstep "..."\n    ...\nend'),
    Code("AR201", ERROR, "no electrons at the source",
         "An arrow starts at electrons that are not there: a lone pair on an atom that has none, a bond "
         "that does not exist, or an unpaired electron on a closed-shell atom.",
         ':C5 -> C6   # C5 is a carbocation: it has no lone pair'),
    Code("AR202", ERROR, "bond order written wrongly",
         "The connector of a source bond says what the bond is before the step. `=` on a single bond "
         "names a pi pair that does not exist. RDKit reads a nitrogen or halogen written with more "
         "bonds than its valence list allows (N(=O)=O, periodate's I(=O)3) charge-separated, X+ and O-: "
         "the pi pair such an X=O was drawn with is a lone pair on O.",
         'C3=C4 -> C4   # C3-C4 is a single bond'),
    Code("AR203", ERROR, "electrons used twice",
         "Two arrows in one step draw on the same electrons (one pair of a single bond, one lone pair "
         "more than the atom has). An arrow from `X=Y` takes the pi pair: a second one from it would "
         "take the sigma pair too, which an arrow names only as `X-Y` (a bond broken right through).",
         'C3-H -> C2=C3\nC3-H -> C3-C7   # the one C3-H pair cannot go two places'),
    Code("AR204", ERROR, "arrow starts at a hydrogen",
         "Arrows start at electrons. A proton (or any hydrogen bonded to an atom) has no lone pair; the "
         "arrow that removes a proton starts at the base's lone pair and ends at the hydrogen. (A free "
         "hydride ion, [H-], has a lone pair, and an arrow may start there.)",
         'H(C3) -> O11     # write  :O11 -> H(C3)  and  C3-H -> ...'),
    Code("AR205", ERROR, "arrow starts at an atom, not at electrons",
         "A bare atom cannot be a source: name a lone pair (`:X`), a bond (`X-Y`) or an unpaired "
         "electron (`.X`).",
         'O11 -> C2   # write :O11 -> C2'),
    Code("AR206", ERROR, "ambiguous sink",
         "A bond pair can only become a lone pair on one of its own atoms. To form a bond to a third "
         "atom, name that bond.",
         'C4=C5 -> H9   # write C4=C5 -> C5-H9'),
    Code("AR207", ERROR, "sink bond shares no atom with the source",
         "Electrons stay on an atom they started on: the new or strengthened bond must contain one "
         "atom of the source.",
         ':O1 -> C2=C3   # O1 is in neither atom of C2=C3'),
    Code("AR208", ERROR, "bond after the step is not what was written",
         "The connector of a sink bond says what the bond will be after the step; the moves give "
         "something else.",
         'C3-H -> C2-C3   # C2-C3 becomes a double bond: write C2=C3'),
    Code("AR209", ERROR, "arrow kind does not fit the electrons",
         "A pair arrow `->` cannot start at one unpaired electron; use a fishhook `~>`. Nor do two "
         "fishhooks send both electrons of a bond onto one atom: that is a pair, one arrow `->`.",
         '.C1 -> C2   # write .C1 ~> C2'),
    Code("AR210", ERROR, "arrow goes nowhere",
         "The sink is the source itself (an atom giving its lone pair to itself, a bond moving into itself).",
         'C2=O3 -> C2=O3   # a pair of C2=O3 moves onto O3 (C2=O3 -> O3) or into a neighbouring bond'),
    Code("AR301", ERROR, "octet exceeded",
         "After the step a second-row atom holds more than eight valence electrons (or hydrogen more "
         "than two). Lewis octet and duet rules (common practice). The hint names the move that makes "
         "room: the atom's pi bond breaking (in a concerted step, sent on to the atom the step leaves "
         "with six electrons: the missing arrow of a Diels-Alder), a leaving group's bond, an X-H pair "
         "going back to X; for a base drawn onto a carbon that holds the proton, the arrow to the hydrogen.",
         'five bonds to one carbon'),
    Code("AR302", ERROR, "bond order out of range",
         "After the step a bond would be more than triple.",
         ':N2 -> C1#N2   # C1#N2 is already triple: a fourth pair has nowhere to go'),
    Code("AR303", ERROR, "odd-electron bond",
         "After the step a bond holds an odd number of electrons: a bond made from single electrons "
         "needs one fishhook from each partner in the same step. A lone fishhook among pair arrows is "
         "most often `~>` typed for `->`: the hint offers the pair arrow first.",
         '.C1 ~> C2   # and no .C2 ~> C1 in the same step'),
    Code("AR304", ERROR, "structure rejected by RDKit",
         "The derived structure does not sanitize in RDKit (valence or aromaticity).",
         ':O3 -> Cl1   # onto Cl2-Cl1 without Cl1-Cl2 -> Cl2: Cl1 with two bonds and a -1 charge'),
    Code("AR305", ERROR, "sigma bond changed in a resonance step",
         "Resonance contributors differ only in where pi electrons and lone pairs are: a resonance "
         "step may not make or break a sigma bond.",
         'step "contributor" resonance\n    C3-Br4 -> Br4   # breaks the C-Br sigma bond: a reaction, not resonance\nend'),
    Code("AR401", ERROR, "checkpoint differs",
         "The state after the step does not contain a structure written with `expect`. The message "
         "names the difference atom by atom, and says so when the written structure is a tautomer of "
         "the derived one (RDKit's tautomer enumerator judges).",
         '    :O11 -> C2\n    expect "CC(C)(O)C"   # the moves give the alkoxide CC(C)([O-])C'),
    Code("AR402", ERROR, "product differs",
         "The state after the last step does not contain the structure written with `product`. As "
         "for AR401, a tautomer of the derived structure (a ketone written where the moves reach its "
         "enol) is called one.",
         'product "CN=C(C)C"   # the moves leave the iminium C[NH+]=C(C)C: a proton transfer is missing'),
    Code("AR403", ERROR, "charge not conserved",
         "The total charge after a step differs from the total before it plus what entered with `uses`.",
         'a safety net: arrows only move electrons, so valid moves conserve charge; it would mean\n'
         'the bookkeeping itself went wrong (please report it with the file)'),
    Code("AR404", ERROR, "atoms not conserved",
         "The atoms after a step differ from the atoms before it plus what entered with `uses`.",
         'a safety net like AR403: moves never add or remove atoms (`releases` keeps them counted)'),
    Code("AR501", WARNING, "small ring closed",
         "A step closes a three- or four-membered ring; five- and six-membered closures usually "
         "outcompete them (common practice).",
         'species dione = "[CH3:1][C:2](=O)[CH-:3][CH2:4][CH2:5][C:6](=[O:7])[CH3:8]"\n'
         'step "closure"\n    :C3 -> C6   # a four-membered ring; the C1 enolate onto C6 would close six\n'
         '    C6=O7 -> O7\nend'),
    Code("AR502", WARNING, "disfavoured ring closure",
         "Baldwin's rules (J. E. Baldwin, J. Chem. Soc., Chem. Commun. 1976, 734; Baldwin and Lusch, "
         "Tetrahedron 1982, 38, 2939) call this closure disfavoured.",
         'an alkoxide onto the far end of a C=C inside the ring it closes: 5-endo-trig'),
    Code("AR503", WARNING, "unusual formal charge",
         "A step leaves an atom with a new formal charge of magnitude two or more (for example carbon -2, "
         "oxygen +2).",
         'C3-O4 -> C3   # the C-O pair stays on carbon: C3 ends at -2 and O4 at +2'),
    Code("AR504", WARNING, "expanded octet",
         "A step takes a third-row or heavier atom above eight valence electrons, or further above "
         "(a shell a step only keeps, as a sulfonyl S that swaps one bond for another, is not flagged); "
         "a d-block metal of groups 3-11 above eighteen (the 18-electron rule).",
         'C4=O5 -> O5-P2   # the oxaphosphetane of a Wittig reaction: P2 with five bonds (fine for P)'),
    Code("AR505", WARNING, "electron-poor heteroatom",
         "A step leaves N, O, S or a halogen with six valence electrons, down from a full octet (a "
         "nitrenium, oxenium or halenium ion). Such ions are rare; most often single-electron arrows "
         "were meant (a homolysis), or a bond should form to the atom in the same step.",
         'Br1-Br2 -> Br1   # under light: Br2 is left as Br+ with six electrons; write\n'
         '                 # Br1-Br2 ~> Br1 and Br1-Br2 ~> Br2 for the homolysis'),
    Code("AR506", WARNING, "step with no moves",
         "A step names no electron moves.",
         'step "workup" under "H3O+"\nend   # write the proton transfers, or leave the step out'),
    Code("AR507", WARNING, "bond order written lower than it is",
         "A source bond is written `-` but is really double or triple; the pi pair is meant, so write `=` or `#`.",
         'C2-O9 -> O9   # C2=O9 is a double bond: write C2=O9 -> O9'),
    Code("AR508", WARNING, "uphill proton transfer",
         "The base's conjugate acid is much weaker than the acid it deprotonates. Not judged: a "
         "proton beside a cation (E1, a protonated carbonyl's alpha C-H) or one whose loss makes "
         "its atom aromatic (an arenium ion or a sigma complex rearomatising).",
         ':O2 -> H(C3)   # water (pKa of hydronium -1.7) taking an alkane C-H (~50)'),
    Code("AR509", WARNING, "migrating group syn to the leaving group",
         "In a 1,2-shift across a double bond of written geometry onto an atom whose leaving group "
         "departs in the same step (the Beckmann rearrangement of an oxime), the group anti to the "
         "leaving group migrates; the step moves the one beside it.",
         'C1-C2 -> C1-N3   # C1 is cis to the leaving O4 across C2=N3: the other group migrates'),
    Code("AR510", WARNING, "leaving group that is a very strong base",
         "A bond to carbon breaks with its pair going to an atom that is left as an anion whose "
         "conjugate acid has a pKa of 35 or more (an amide ion R2N-, a carbanion with no neighbour "
         "to spread its charge, a hydride ion). Good leaving groups are weak bases (common practice); "
         "such a group is protonated before it leaves, or its pair goes on into a bond in the same step.",
         'C8-N20 -> N20   # the amine leaves a carbinolamine as R2N- (pKa of R2NH ~38): protonate N20 first'),
    Code("AR511", WARNING, "unstabilised primary carbocation",
         "A step leaves a methyl or primary carbocation with no neighbouring lone pair, pi bond or arene "
         "to spread the charge. Such cations are not intermediates in solution (common practice: SN1 "
         "and E1 go through tertiary, secondary, allylic or benzylic cations; Markovnikov's rule).",
         'C1=C2 -> C2-H(O5)   # isobutene protonated at C2 leaves CH2+ on C1: protonate C1, giving the '
         'tert-butyl cation'),
    Code("AR512", WARNING, "release takes the molecule that reacted",
         "`releases` takes away the whole molecule the named atom belongs to. Here that molecule holds "
         "every atom the step's arrows touch (or, in a step with no arrows, it is the largest molecule "
         "left): the atom meant to leave is still bonded to it (a leaving group whose bond the arrows "
         "do not break). A small molecule the step makes to let go while a larger one stays (silver "
         "bromide from Ag+ and Br-) is not flagged.",
         ':O6 -> C2\n    C2=O3 -> O3\n    releases O4   # methoxide is still bonded to C2: break C2-O4 '
         '(after the C=O re-forms) before releasing it'),
    Code("AR513", WARNING, "pi pair pushed onto one end with nothing at the other",
         "A step sends the pi pair of a bond onto one of its atoms while nothing bonds to the other, "
         "leaving that one a cation beside it (C+ beside O-). That is the bond's polarised "
         "resonance form; as a step it usually means the arrow that brings a nucleophile to the "
         "cation is missing.",
         'step "methanol adds"\n    C2=O3 -> O3      # and :O11 -> C2, the nucleophile, is forgotten'),
    Code("AR601", NOTE, "ring closure",
         "A step closes a ring; its size and Baldwin class are given. A pericyclic step (every arrow "
         "from a bond to a bond, round a closed loop that makes no charge; arrows that all start at "
         "bonds and change every atom of the ring they close, as in a Nazarov closure; or a sigmatropic "
         "shift drawn from a lone pair, whose ring exists only in the transition state) reports the "
         "rings of the structure after it, without a Baldwin class: "
         "a Diels-Alder closes one, a Cope or [2,3]-Wittig shift none. A 1,2-shift closes no ring. "
         "Two molecules joined by two new bonds in one step (a bromonium ion, a peracid's epoxide, a "
         "carbene's cyclopropane) make a ring between them: noted with its size, without a Baldwin class; "
         "when one atom takes a lone pair from each of two atoms of one molecule (magnesium holding both "
         "oxygens of a Weinreb amide's adduct) the note calls the ring a chelate. "
         "Baldwin's rules are stated for first-row atoms: a closure at a heavier one (the phosphorus of "
         "an oxaphosphetane, the iodine of a cyclic periodate ester) is given no class (a three- or "
         "four-membered one still draws AR501).",
         'C2=C3 -> C3-C7   # an enolate onto a ketone of its own chain: 5-(enolexo)-exo-trig, favoured'),
    Code("AR602", NOTE, "stereocentres",
         "Stereocentres or stereogenic double bonds made or lost in a step, and how many "
         "stereoisomers the product can have when the mechanism controls none of them. A centre that "
         "is stereogenic only in one resonance structure (the sigma complex of an aromatic "
         "substitution) is not reported. A configuration written in a species is carried through "
         "the steps (inverted by a backside substitution, kept by a 1,2-shift). New centres made by a "
         "concerted, cyclic addition to both atoms of a double bond of known geometry (written E or Z, "
         "or in a ring of up to seven atoms): a peracid epoxidation, a bromonium ion, hydroboration, a "
         "Diels-Alder dienophile, get the configuration of a syn addition, both new bonds on one face; "
         "a bromonium ion opened from the back then gives the anti product. The ends of a "
         "Diels-Alder diene written E or Z at both ends are configured the same way (suprafacial: "
         "outside groups cis), unless the dienophile's carbons are configured too (endo or exo is "
         "not known). A concerted elimination "
         "across two configured centres sets the new double bond's geometry: anti-periplanar (E2), or "
         "syn when the leaving group takes the hydrogen (a Cope elimination). Other new centres (an "
         "aldol's, an addition to C=O) are counted as free.",
         '    :O4 -> C2=O3 ... an aldol addition: new stereocentre C5 (a note, not a fault)'),
    Code("AR603", WARNING, "configuration written otherwise",
         "A checkpoint or the product is written with a configuration (@, @@, / or \\) that the steps "
         "do not give: a diastereomer of the derived structure, or its enantiomer when a species was "
         "written with a configured centre. Only pieces of the same constitution are compared, and only "
         "when the steps configure as many stereo elements as are written; an enantiomer of a product "
         "formed as the racemate is no mismatch.",
         'product "C/C=C(/C)c1ccccc1"   # Z written; the anti E2 of the (2R,3R) bromide gives E'),
)


@frozen
class Diagnostic:
    code: str
    message: str
    loc: Location
    hint: Optional[str] = None
    atoms: tuple[str, ...] = ()   # atom labels such as "C7" or "H(C3)"
    bonds: tuple[tuple[str, str], ...] = ()
    step: Optional[int] = None    # 0-based step index, when the diagnostic belongs to a step
    severity: str = field(default="")

    def __post_init__(self) -> None:
        if not self.severity:
            object.__setattr__(self, "severity", CODES[self.code].severity)

    def to_text(self) -> str:
        text = f"{self.loc}: {self.severity} {self.code} {self.message}"
        if self.hint:
            text += f"\n    hint: {self.hint}"
        return text

    def to_dict(self) -> dict:
        return {
            "file": self.loc.file, "line": self.loc.line, "column": self.loc.column,
            "severity": self.severity, "code": self.code, "message": self.message,
            "hint": self.hint, "atoms": list(self.atoms),
            "bonds": [list(b) for b in self.bonds], "step": self.step,
        }


def sort_key(d: Diagnostic) -> tuple:
    return (d.loc.file, d.loc.line, d.loc.column, SEVERITY_RANK[d.severity], d.code)


def to_json(diags: Iterable[Diagnostic]) -> str:
    import json   # only --format json needs it
    return json.dumps([d.to_dict() for d in diags], indent=2, ensure_ascii=False)


class MechanismError(Exception):
    """Raised when a file cannot be turned into a Mechanism at all; carries its diagnostics."""

    def __init__(self, diagnostics: list[Diagnostic]):
        self.diagnostics = diagnostics
        super().__init__("\n".join(d.to_text() for d in diagnostics))
