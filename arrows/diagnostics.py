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
         "The file could not be read: it is missing or unreadable, not UTF-8 text, holds NUL bytes, is "
         "larger than the 5 MB limit, or (for `arrows import`) is not the JSON it should be.",
         'arrows check scheme.cdx   # a binary drawing file, not mechanism text'),
    Code("AR101", ERROR, "syntax error",
         "The text does not follow the mechanism language.",
         'species water = "[OH2:1]"\n'
         'species amide = "[NH2-:2]"\n'
         'step "proton transfer"\n'
         '    :N2 -> H(O1)\n'
         '    O1-H -> O1\n'
         '# the file ends here: `end` is missing'),
    Code("AR102", ERROR, "SMILES not understood",
         "RDKit could not read the SMILES of a species, checkpoint or product. RDKit's reason is given "
         "in the author's terms: an atom over its valence is named as written ([C-], atom 3 as written), "
         "the error located at it. A dative bond (`->`, which RDKit reads) is refused too: the "
         "bookkeeping books every bond as one electron from each of its atoms; a ligand is written with "
         "the charges its pair leaves, C[P+](C)(C)[Pd-] for a phosphine on palladium.",
         'species dione = "CC(=O)CC(C"   # unclosed branch'),
    Code("AR103", ERROR, "map number used twice",
         "Every atom map number must be unique across the whole mechanism, so that a move names one atom.",
         'species methanol = "[CH3:1][OH:2]"\n'
         'species water = "[OH2:2]"   # 2 is methanol\'s oxygen already: write [OH2:3]'),
    Code("AR104", ERROR, "unknown atom",
         "A move names a map number that no species declares.",
         'species water = "[OH2:1]"\n'
         'species amide = "[NH2-:2]"\n'
         'step "proton transfer"\n'
         '    :N7 -> H(O1)   # no species holds atom 7: the amide nitrogen is N2\n'
         '    O1-H -> O1\n'
         'end'),
    Code("AR105", ERROR, "element does not match",
         "The element written with a map number differs from the element of that atom in the SMILES.",
         'species acetone = "[CH3:1][C:2](=[O:3])[CH3:4]"\n'
         'species cyanide = "[C-:5]#[N:6]"\n'
         'step "cyanide adds"\n'
         '    :C5 -> C2\n'
         '    C3=O2 -> O3   # atom 3 is oxygen and 2 carbon: write C2=O3 -> O3\n'
         'end'),
    Code("AR106", ERROR, "atom already released",
         "A move or checkpoint uses an atom whose fragment left the drawing with `releases` in an earlier step.",
         'species bromide = "[CH3:1][C:2]([CH3:3])([CH3:4])[Br:5]"\n'
         'step "ionisation"\n'
         '    C2-Br5 -> Br5\n'
         '    releases Br5\n'
         'end\n'
         'step "capture"\n'
         '    :Br5 -> C2   # bromide left the drawing in the step before\n'
         'end'),
    Code("AR107", ERROR, "statement after the product",
         "`product` closes the mechanism: no step or second product may follow it.",
         'species methoxide = "[CH3:1][O-:2]"\n'
         'species iodomethane = "[CH3:3][I:4]"\n'
         'step "substitution"\n'
         '    :O2 -> C3\n'
         '    C3-I4 -> I4\n'
         'end\n'
         'product "COC.[I-]"\n'
         'step "workup"   # after the product: move it before `product`\n'
         'end'),
    Code("AR108", ERROR, "duplicate species name",
         "Two species (or `uses` entries) share one name.",
         'species water = "[OH2:1]"\n'
         'species water = "[OH2:2]"   # name the second one water_2'),
    Code("AR109", ERROR, "no such hydrogen",
         "`H(X)` or `X-H` names a hydrogen on X, but X carries none at that point. A hydrogen that moves "
         "with its pair or electron keeps the name of the atom it leaves (`C1-H -> O4-H(C1)`), as the hint "
         "writes when the sink's `X-H` was meant for it.",
         'species methoxide = "[CH3:1][O-:2]"\n'
         'species water = "[OH2:3]"\n'
         'step "proton transfer"\n'
         '    :O2 -> H(O3)\n'
         '    O2-H -> O2   # the O-H bond that breaks is water\'s: write O3-H -> O3\n'
         'end'),
    Code("AR110", ERROR, "data-set record is not JSON",
         "A line of a JSONL data set (`arrows check --jsonl`) is not UTF-8 JSON text, or not a JSON object.",
         '{"id": "r1", "text": "species w = ..."   # the closing brace is missing'),
    Code("AR111", ERROR, "data-set record does not follow the schema",
         "A JSONL record lacks a field or gives one of the wrong type; arrows/jsonl-input.schema.json "
         "describes the record.",
         '{"id": "r2", "steps": []}   # neither "text" nor "species" is given'),
    Code("AR112", ERROR, "nothing to check",
         "The file holds no species and no steps: it is empty, or comments only.",
         '# Aldol of propanal: species and steps still to write\n'
         '# (a file of comments only)'),
    Code("AR113", WARNING, "data-set record id used twice",
         "Two records of a JSONL data set (`arrows check --jsonl`) have the same `id`; results are joined "
         "back to their records by id. The warning is on the second record, naming the first one's line.",
         '{"id": "r1", "text": "..."}\n'
         '{"id": "r1", "text": "..."}   # the second r1: give it an id of its own'),
    Code("AR201", ERROR, "no electrons at the source",
         "An arrow starts at electrons that are not there: a lone pair on an atom that has none, a bond "
         "that does not exist, or an unpaired electron on a closed-shell atom.",
         'species cation = "[CH3:1][C+:2]([CH3:3])[CH3:4]"\n'
         'species water = "[OH2:5]"\n'
         'step "capture"\n'
         '    :C2 -> O5   # C2, a carbocation, has no lone pair: write :O5 -> C2\n'
         'end'),
    Code("AR202", ERROR, "bond order written wrongly",
         "The connector of a source bond says what the bond is before the step. `=` on a single bond "
         "names a pi pair that does not exist. RDKit reads a nitrogen or halogen written with more "
         "bonds than its valence list allows (N(=O)=O, periodate's I(=O)3) charge-separated, X+ and O-: "
         "the pi pair such an X=O was drawn with is a lone pair on O.",
         'species bromide = "[CH3:1][CH2:2][Br:3]"\n'
         'species base = "[OH-:4]"\n'
         'step "elimination"\n'
         '    :O4 -> H(C1)\n'
         '    C1-H -> C1=C2\n'
         '    C2=Br3 -> Br3   # C2-Br3 is a single bond: write C2-Br3 -> Br3\n'
         'end'),
    Code("AR203", ERROR, "electrons used twice",
         "Two arrows in one step draw on the same electrons (one pair of a single bond, one lone pair "
         "more than the atom has). An arrow from `X=Y` takes the pi pair: a second one from it would "
         "take the sigma pair too, which an arrow names only as `X-Y` (a bond broken right through).",
         'species propene = "[CH3:1][CH:2]=[CH2:3]"\n'
         'species hbr = "[Br:4][H:5]"\n'
         'step "addition"\n'
         '    C2=C3 -> C3-H5\n'
         '    C2=C3 -> C2-Br4   # the one pi pair cannot go two places\n'
         '    H5-Br4 -> Br4\n'
         'end'),
    Code("AR204", ERROR, "arrow starts at a hydrogen",
         "Arrows start at electrons. A proton (or any hydrogen bonded to an atom) has no lone pair; the "
         "arrow that removes a proton starts at the base's lone pair and ends at the hydrogen. (A free "
         "hydride ion, [H-], has a lone pair, and an arrow may start there.)",
         'species butanone = "[CH3:1][C:2](=[O:9])[CH2:3][CH3:4]"\n'
         'species base = "[OH-:11]"\n'
         'step "enolate formation"\n'
         '    H(C3) -> O11   # arrows start at electrons: write :O11 -> H(C3)\n'
         '    C3-H -> C2=C3\n'
         '    C2=O9 -> O9\n'
         'end'),
    Code("AR205", ERROR, "arrow starts at an atom, not at electrons",
         "A bare atom cannot be a source: name a lone pair (`:X`), a bond (`X-Y`) or an unpaired "
         "electron (`.X`).",
         'species ammonia = "[NH3:1]"\n'
         'species iodomethane = "[CH3:2][I:3]"\n'
         'step "substitution"\n'
         '    N1 -> C2   # an atom is not electrons: write :N1 -> C2\n'
         '    C2-I3 -> I3\n'
         'end'),
    Code("AR206", ERROR, "ambiguous sink",
         "A bond pair can only become a lone pair on one of its own atoms. To form a bond to a third "
         "atom, name that bond.",
         'species propene = "[CH3:1][CH:2]=[CH2:3]"\n'
         'species hbr = "[Br:4][H:5]"\n'
         'step "protonation"\n'
         '    C2=C3 -> H5   # a pair of C2=C3 cannot sit on H5: write C2=C3 -> C3-H5\n'
         '    H5-Br4 -> Br4\n'
         'end'),
    Code("AR207", ERROR, "sink bond shares no atom with the source",
         "Electrons stay on an atom they started on: the new or strengthened bond must contain one "
         "atom of the source.",
         'species ammonia = "[NH3:1]"\n'
         'species iodomethane = "[CH3:2][I:3]"\n'
         'step "substitution"\n'
         '    :N1 -> C2-I3   # N1 is in neither atom of C2-I3: write :N1 -> C2\n'
         '    C2-I3 -> I3\n'
         'end'),
    Code("AR208", ERROR, "bond after the step is not what was written",
         "The connector of a sink bond says what the bond will be after the step; the moves give "
         "something else.",
         'species bromide = "[CH3:1][CH2:2][Br:3]"\n'
         'species base = "[OH-:4]"\n'
         'step "elimination"\n'
         '    :O4 -> H(C1)\n'
         '    C1-H -> C1-C2   # C1-C2 becomes a double bond: write C1=C2\n'
         '    C2-Br3 -> Br3\n'
         'end'),
    Code("AR209", ERROR, "arrow kind does not fit the electrons",
         "A pair arrow `->` cannot start at one unpaired electron; use a fishhook `~>`. Nor do two "
         "fishhooks send both electrons of a bond onto one atom: that is a pair, one arrow `->`.",
         'species methyl = "[CH3:1]"\n'
         'species methyl_2 = "[CH3:2]"\n'
         'step "recombination"\n'
         '    .C1 -> C1-C2   # one electron: write .C1 ~> C1-C2\n'
         '    .C2 ~> C1-C2\n'
         'end'),
    Code("AR210", ERROR, "arrow goes nowhere",
         "The sink is the source itself (an atom giving its lone pair to itself, a bond moving into itself).",
         'species acetone = "[CH3:1][C:2](=[O:3])[CH3:4]"\n'
         'species hydroxide = "[OH-:5]"\n'
         'step "addition"\n'
         '    :O5 -> C2\n'
         '    C2=O3 -> C2=O3   # goes nowhere: the pi pair moves onto O3, C2=O3 -> O3\n'
         'end'),
    Code("AR301", ERROR, "octet exceeded",
         "After the step a second-row atom holds more than eight valence electrons (or hydrogen more "
         "than two). Lewis octet and duet rules (common practice). The hint names the move that makes "
         "room: the atom's pi bond breaking (in a concerted step, sent on to the atom the step leaves "
         "with six electrons: the missing arrow of a Diels-Alder), a leaving group's bond, an X-H pair "
         "going back to X; for a pair drawn onto a carbon with no bond to give up, an electron-poor "
         "neighbour (the carbon of a C=O, a carbocation: a mistyped number), and the arrow to a hydrogen "
         "where that C-H is acidic by the acidity table.",
         'species hydroxide = "[OH-:1]"\n'
         'species chloromethane = "[CH3:2][Cl:3]"\n'
         'step "substitution"\n'
         '    :O1 -> C2   # C2 would have five bonds: C2-Cl3 -> Cl3 is missing\n'
         'end'),
    Code("AR302", ERROR, "bond order out of range",
         "After the step a bond would be more than triple.",
         'species cyanide = "[C-:1]#[N:2]"\n'
         'species iodomethane = "[CH3:3][I:4]"\n'
         'step "substitution"\n'
         '    :C1 -> C1#N2   # C1#N2 is already triple: the pair goes to C3, :C1 -> C3\n'
         '    C3-I4 -> I4\n'
         'end'),
    Code("AR303", ERROR, "odd-electron bond",
         "After the step a bond holds an odd number of electrons: a bond made from single electrons "
         "needs one fishhook from each partner in the same step. A lone fishhook among pair arrows is "
         "most often `~>` typed for `->`: the hint offers the pair arrow first.",
         'species methyl = "[CH3:1]"\n'
         'species methyl_2 = "[CH3:2]"\n'
         'step "recombination"\n'
         '    .C1 ~> C1-C2   # alone: C1-C2 holds one electron; add .C2 ~> C1-C2\n'
         'end'),
    Code("AR304", ERROR, "structure rejected by RDKit",
         "The derived structure does not sanitize in RDKit (valence or aromaticity).",
         'species chlorine = "[Cl:1][Cl:2]"\n'
         'species hydroxide = "[OH-:3]"\n'
         'step "attack on chlorine"\n'
         '    :O3 -> Cl1   # Cl1-Cl2 -> Cl2 is missing: Cl1 would have two bonds, charge -1\n'
         'end'),
    Code("AR305", ERROR, "sigma bond changed in a resonance step",
         "Resonance contributors differ only in where pi electrons and lone pairs are: a resonance "
         "step may not make or break a sigma bond.",
         'species allyl = "[CH2:1]=[CH:2][CH2:3][Br:4]"\n'
         'step "contributor" resonance\n'
         '    C3-Br4 -> Br4   # breaks the C-Br sigma bond: a reaction, not resonance\n'
         'end'),
    Code("AR401", ERROR, "checkpoint differs",
         "The state after the step does not contain a structure written with `expect`. The message "
         "names the difference atom by atom, and says so when the written structure is a tautomer of "
         "the derived one (RDKit's tautomer enumerator judges).",
         'species acetone = "[CH3:1][C:2](=[O:3])[CH3:4]"\n'
         'species cyanide = "[C-:5]#[N:6]"\n'
         'step "cyanide adds"\n'
         '    :C5 -> C2\n'
         '    C2=O3 -> O3\n'
         '    expect "CC(C)(O)C#N"   # the moves give the alkoxide CC(C)([O-])C#N\n'
         'end'),
    Code("AR402", ERROR, "product differs",
         "The state after the last step does not contain the structure written with `product`. As "
         "for AR401, a tautomer of the derived structure (a ketone written where the moves reach its "
         "enol) is called one; otherwise the hint gives the SMILES the moves reach, the piece closest "
         "to the one written.",
         'species ammonia = "[NH3:1]"\n'
         'species iodomethane = "[CH3:2][I:3]"\n'
         'step "substitution"\n'
         '    :N1 -> C2\n'
         '    C2-I3 -> I3\n'
         'end\n'
         'product "CN.[I-]"   # the moves give C[NH3+]: a proton transfer is missing'),
    Code("AR403", ERROR, "charge not conserved",
         "The total charge after a step differs from the total before it plus what entered with `uses`.",
         'a safety net: arrows only move electrons, so valid moves conserve charge;\n'
         'it would mean the bookkeeping itself went wrong (please report it with the file)'),
    Code("AR404", ERROR, "atoms not conserved",
         "The atoms after a step differ from the atoms before it plus what entered with `uses`.",
         'a safety net like AR403: moves never add or remove atoms\n'
         '(`releases` keeps them counted)'),
    Code("AR501", WARNING, "small ring closed",
         "A step closes a three- or four-membered ring; five- and six-membered closures usually "
         "outcompete them (common practice). Said also onto an oxocarbenium or iminium ion, where "
         "Baldwin's disfavour is excused but the strain is not. Where a displacement Baldwin favours "
         "closes the small ring and the only five- or six-membered closure of its kind is disfavoured "
         "(5-chloropentan-2-one's cyclopropane), the hint names that closure, which does not outrun it.",
         'species dione = "[CH3:1][C:2](=O)[CH-:3][CH2:4][CH2:5][C:6](=[O:7])[CH3:8]"\n'
         'step "closure"\n    :C3 -> C6   # a four-membered ring; the C1 enolate onto C6 would close six\n'
         '    C6=O7 -> O7\nend'),
    Code("AR502", WARNING, "disfavoured ring closure",
         "Baldwin's rules (J. E. Baldwin, J. Chem. Soc., Chem. Commun. 1976, 734; Baldwin and Lusch, "
         "Tetrahedron 1982, 38, 2939) call this closure disfavoured; the message and hint name a favoured "
         "closure the species offers (a five- or six-membered one first, as `arrows closures` ranks them; "
         "then between the same kinds of sites, else from the same nucleophile). A disfavoured aldol or "
         "olefination closure with no favoured one open, written `reversible` and carried on by a later "
         "step that breaks the adduct's C-O bond (an E1cB dehydration), is an AR601 note instead "
         "(thermodynamic control). A 1,3-dicarbonyl anion is enolexo when either carbonyl stays outside "
         "the ring, whichever form is drawn. "
         "An epoxide, aziridine or halonium ion opened at its far carbon is named by its C-C bond, inside "
         "the new ring: 6- or 7-endo-tet, disfavoured where the exo opening at the near carbon closes a "
         "five- or six-membered ring (Nicolaou et al., J. Am. Chem. Soc. 1989, 111, 5330, memory); the "
         "hint names that opening and the cases where endo wins (a vinyl epoxide, a template).",
         'species alkoxide = "[O-:1][CH2:2][CH2:3][C:4](=[CH2:5])[C:6](=[O:7])[CH3:8]"\n'
         'step "closure"\n'
         '    :O1 -> C5   # C4=C5 lies inside the ring it closes: 5-endo-trig\n'
         '    C4=C5 -> C4=C6\n'
         '    C6=O7 -> O7\n'
         'end'),
    Code("AR503", WARNING, "unusual formal charge",
         "A step raises an atom's formal charge to magnitude two or more, or turns its sign (for example "
         "carbon -2, oxygen +2). A charge the step lowers is not judged (periodate written I+3, as RDKit "
         "holds it, taking an alcohol to I+2). Not judged either: an ionic metal (Mg2+, Zn2+), a bare d- or f-block ion with no bond "
         "(Fe3+), and a d-block metal whose negative charge the onium atoms bonded to it balance (a "
         "phosphine ligand written P+ to Pd-, the only way to write a dative bond).",
         'species sulfate = "[O-:1][S:2](=[O:3])(=[O:4])[O-:5]"\n'
         'step "sulfate falls apart"\n'
         '    S2-O5 -> O5   # O5 left as oxide, charge -2: sulfate does not lose O2-\n'
         'end'),
    Code("AR504", WARNING, "expanded octet",
         "A step takes a third-row or heavier atom above eight valence electrons, or further above "
         "(a shell a step only keeps, as a sulfonyl S that swaps one bond for another, is not flagged); "
         "a d-block metal of groups 3-11 above eighteen (the 18-electron rule). A lanthanide or actinide "
         "is not judged (its bonding is ionic). A halogen taken beyond eight with an odd count or a charge "
         "of -2 is told so: that is no hypervalent halogen but electrons gone astray; so is a phosphorus "
         "that kept its lone pair and became negative (P(III) is the nucleophile). Not judged: a P or S "
         "brought to ten by the double bond the step makes while its sigma partners and lone pairs "
         "number four (the P=O of a phosphate or phosphine oxide, a sulfoxide's S=O, drawn so by chemists), and "
         "a charge-separated oxo centre whose count, with an X=O for each positive charge beside an O-, "
         "the step does not raise (an alcohol adding to periodate written I+3 with four O-).",
         'species cation = "Cl[P+:1](Cl)(Cl)Cl"\n'
         'species chloride = "[Cl-:2]"\n'
         'step "chloride adds"\n'
         '    :Cl2 -> P1   # PCl5: ten valence electrons on P1 (usual for phosphorus)\n'
         'end'),
    Code("AR505", WARNING, "electron-poor heteroatom",
         "A step leaves N, O, S or a halogen with six valence electrons, down from a full octet (a "
         "nitrenium, oxenium or halenium ion). Such ions are rare; most often single-electron arrows "
         "were meant (a homolysis), or a bond should form to the atom in the same step.",
         'species bromine = "[Br:1][Br:2]"\n'
         'step "homolysis" under "light"\n'
         '    # two fishhooks were meant: Br1-Br2 ~> Br1 and Br1-Br2 ~> Br2\n'
         '    Br1-Br2 -> Br1   # a pair arrow leaves Br2 as Br+ with six electrons\n'
         'end'),
    Code("AR506", WARNING, "step with no moves",
         "A step names no electron moves.",
         'species acid = "[CH3:1][C:2](=[O:3])[OH:4]"\n'
         'species base = "[OH-:5]"\n'
         'step "deprotonation"\n'
         '    :O5 -> H(O4)\n'
         '    O4-H -> O4\n'
         'end\n'
         'step "workup" under "H3O+"   # no moves: write them, or leave the step out\n'
         'end'),
    Code("AR507", WARNING, "bond order written lower than it is",
         "A source bond is written `-` but is really double or triple; the pi pair is meant, so write `=` or `#`.",
         'species acetone = "[CH3:1][C:2](=[O:3])[CH3:4]"\n'
         'species cyanide = "[C-:5]#[N:6]"\n'
         'step "cyanide adds"\n'
         '    :C5 -> C2\n'
         '    C2-O3 -> O3   # C2=O3 is a double bond: write C2=O3 -> O3\n'
         'end'),
    Code("AR508", WARNING, "uphill proton transfer",
         "The base's conjugate acid is much weaker than the acid it deprotonates. An alkene that "
         "takes a proton to make a bare carbocation is judged against an estimate for that "
         "carbocation's C-H (~-10): only a strong acid protonates it. A proton put on a nitrogen "
         "whose lone pair is part of an aromatic sextet (pyrrole's, indole's, an azole's N-H nitrogen) "
         "makes a cation that is no longer aromatic, judged against -4 (pyrrole's conjugate acid, "
         "protonated at C2, is -3.8; memory) and warned on if uphill at all, whatever the threshold: "
         "the same ring takes the proton elsewhere (an azole's pyridine-type N, a pyrrole's C2, an "
         "indole's C3). A hydrogen taken as a proton off boron, aluminium, silicon, germanium, tin "
         "or a metal of groups 1, 2, 12 or 13 is warned on whatever the threshold: such a hydrogen "
         "is hydridic, leaving with the bond's pair (common practice); d-block hydrides of groups "
         "3-11 (H-Pd-X) are not judged. A C-H taken as the O (or N) its pair is pushed onto takes "
         "a proton from an acid HA in the same step makes the enol, and the step is judged as a "
         "whole: [pKa(C-H) - pKa(BH+)] + [pKa(HA) - pKa(enol O-H)]. Not judged: a "
         "proton beside a cation (E1, a protonated carbonyl's alpha C-H; an azolium's C2-H is "
         "judged against its own value), also where its pair goes into a C=C whose pi pair moves on "
         "into the cation (a vinylogous E1: the proton lost after a Nazarov closure), or one whose loss makes "
         "its atom aromatic (an arenium ion or a sigma complex rearomatising).",
         'species acetone = "[CH3:1][C:2](=[O:3])[CH3:4]"\n'
         'species water = "[OH2:5]"\n'
         'step "enolisation"\n'
         '    :O5 -> H(C1)   # water (H3O+ pKa -1.7) vs acetone\'s C-H (~19-20, memory)\n'
         '    C1-H -> C1=C2\n'
         '    C2=O3 -> O3\n'
         'end'),
    Code("AR509", WARNING, "migrating group syn to the leaving group",
         "In a 1,2-shift across a double bond of written geometry onto an atom whose leaving group "
         "departs in the same step (the Beckmann rearrangement of an oxime), the group anti to the "
         "leaving group migrates; the step moves the one beside it.",
         'species oxime = "C[C:2](=[N:3]/[OH2+:4])/[c:1]1ccccc1"\n'
         'step "migration"\n'
         '    C1-C2 -> C1-N3   # phenyl C1 is cis to the leaving O4: the methyl migrates\n'
         '    N3-O4 -> O4\n'
         '    :N3 -> C2#N3\n'
         'end'),
    Code("AR510", WARNING, "leaving group that is a very strong base",
         "A bond to carbon, or to the phosphorus or sulfur of an onium ion or its adduct, breaks with its pair going to an atom that is left as an anion whose "
         "conjugate acid has a pKa of 35 or more (an amide ion R2N-, a carbanion with no neighbour "
         "to spread its charge, a hydride ion). Good leaving groups are weak bases (common practice); "
         "such a group is protonated before it leaves, or its pair goes on into a bond in the same step. "
         "At P or S, a carbanion pushed off as P=O forms (a phosphonium salt cleaved by base) and any oxygen "
         "leaving are not judged. Hydroxide or an alkoxide displaced from an sp3 carbon by a nucleophile in "
         "one step (an SN2 of an alcohol or ether) is flagged too: it is protonated, or made a sulfonate or "
         "halide, first; a three- or four-membered ring opened (an epoxide), a phenoxide or carboxylate "
         "leaving are not.",
         'species adduct = "C[C:1]([O-:2])(C)[N:3](C)C"\n'
         'step "the amine leaves"\n'
         '    :O2 -> C1=O2\n'
         '    C1-N3 -> N3   # Me2N- leaves (pKa of Me2NH ~38, memory): protonate N3 first\n'
         'end'),
    Code("AR511", WARNING, "unstabilised primary or alpha-carbonyl carbocation, silylium or sulfonyl cation",
         "A step leaves a methyl or primary carbocation with no neighbouring lone pair, pi bond or arene "
         "to spread the charge, nor a CH2 bonded to a d-block metal beside it (an alkene's pi pair into "
         "the metal: the cation bridged to it). Such cations are not intermediates in solution (common "
         "practice: SN1 and E1 go through tertiary, secondary, allylic or benzylic cations; Markovnikov's "
         "rule). "
         "Likewise a carbocation made on a carbon bonded to the carbon of a C=O, C=N or C#N, with no "
         "O, N or S lone pair, pi bond, arene or cyclopropane beside it: such cations are strongly "
         "destabilised (Creary, Acc. Chem. Res. 1985; memory), most often an arrow drawn the wrong way "
         "(an enone's C=C sent to a nucleophile: the enone is the electrophile, and the hint writes the "
         "conjugate addition). "
         "Likewise a bare three-coordinate silicon cation (R3Si+, a silylium ion) or sulfonyl cation "
         "(RSO2+) made by a step: a silyl or sulfonyl group moves by a nucleophile's attack at Si or S "
         "(a pentacoordinate silicate, as in a Peterson elimination; an addition at S), not set free "
         "(common practice).",
         'species alkene = "[CH2:1]=[C:2]([CH3:3])[CH3:4]"\n'
         'species acid = "[OH3+:5]"\n'
         'step "protonation"\n'
         '    C1=C2 -> C2-H(O5)   # leaves CH2+ on C1: protonate C1 (tert-butyl cation)\n'
         '    O5-H -> O5\n'
         'end'),
    Code("AR512", WARNING, "release takes the molecule that reacted",
         "`releases` takes away the whole molecule the named atom belongs to. Here that molecule holds "
         "every atom the step's arrows touch (or, in a step with no arrows, it is the largest molecule "
         "left): the atom meant to leave is still bonded to it (a leaving group whose bond the arrows "
         "do not break). A small molecule the step makes to let go while a larger one stays (silver "
         "bromide from Ag+ and Br-), or one released beside a larger molecule a later step goes on with, "
         "is not flagged.",
         'species ester = "[CH3:1][C:2](=[O:3])[O:4][CH3:5]"\n'
         'species hydroxide = "[OH-:6]"\n'
         'step "addition"\n'
         '    :O6 -> C2\n'
         '    C2=O3 -> O3\n'
         '    releases O4   # methoxide is still bonded to C2: the whole adduct goes\n'
         'end'),
    Code("AR513", WARNING, "pi pair pushed onto one end with nothing at the other",
         "A step sends the pi pair of a bond onto one of its atoms while nothing bonds to the other, "
         "leaving that one a cation beside it (C+ beside O-). That is the bond's polarised "
         "resonance form; as a step it usually means the arrow that brings a nucleophile to the "
         "cation is missing.",
         'species aldehyde = "[CH3:1][CH:2]=[O:3]"\n'
         'species cyanide = "[C-:4]#[N:5]"\n'
         'step "cyanide adds"\n'
         '    C2=O3 -> O3   # and :C4 -> C2, the nucleophile\'s arrow, is forgotten\n'
         'end'),
    Code("AR514", WARNING, "pi pair pushed onto a carbon that cannot hold it",
         "A step sends the pi pair of a bond onto one of its carbons, which keeps it as a lone pair: "
         "a carbanion with no pi bond, arene, onium, sulfur, phosphorus, silicon or pair of halogens "
         "beside it to take the charge. A polar pi bond gives its pair to its more electronegative "
         "atom (C=O to O; nucleophiles add at the carbon), and a C=C pair goes on into a bond or "
         "toward an enone's carbonyl (common practice). A nucleophile that bonds to the O or N of a C=O, "
         "C=N or C#N (an iminium or nitrilium ion, an isocyanate, a carbodiimide), or to the CH2 end of a "
         "ketene, while the pi pair goes onto the carbon is warned on whatever would then hold the "
         "charge (an acyl or imidoyl anion, an N+ beside it): a carbanion, a hydride, water, an alcohol, "
         "an amine or a carboxylate adds at the carbon (a phosphite on a diketone's O is not judged). "
         "Likewise a carbon nucleophile (an arene's pi pair, a "
         "carbanion) or a hydride bonded to the oxygen of an N=O, P=O or S=O whose N, P or S holds no lone pair "
         "(the nitronium ion, SO3) while the pi pair goes onto that atom: the N, P or S is the electrophile "
         "(textbook nitration and sulfonation); a nitroso N or a sulfoxide S, which hold a lone pair, is not "
         "judged. A resonance step is not judged.",
         'species ketone = "[CH3:1][C:2](=[O:3])[CH3:4]"\n'
         'species enolate = "[CH3:5][C:6](=[O:7])[CH2-:8]"\n'
         'step "enolate adds"\n'
         '    :C8 -> O3\n'
         '    C2=O3 -> C2   # onto the carbon: it is O3 that takes the pair, C8 adds to C2\n'
         'end'),
    Code("AR515", WARNING, "hydroxide or alkoxide leaving to a carbocation",
         "A bond from carbon to oxygen breaks, the pair going to the oxygen, which leaves as hydroxide "
         "or an alkoxide while the carbon is left a carbocation with nothing pushing. These are poor "
         "leaving groups: they leave when pushed out (an E1cB, a tetrahedral intermediate re-forming "
         "C=O), and for an ionisation the oxygen is protonated first and leaves as water or an alcohol "
         "(common practice: the acid-catalysed E1 and SN1 of alcohols).",
         'species alcohol = "[CH3:1][C:2]([CH3:3])([CH3:4])[OH:5]"\n'
         'step "ionisation"\n'
         '    C2-O5 -> O5   # hydroxide leaves on its own: protonate O5 first\n'
         'end'),
    Code("AR516", WARNING, "carbocation shift uphill",
         "A 1,2-shift of a hydrogen or a carbon group to a carbocation leaves a less stabilised cation "
         "where the group was (tertiary to secondary, or away from a neighbouring pi bond or lone pair). "
         "Hydride and alkyl shifts run toward the more stable cation (common practice: the "
         "Wagner-Meerwein and pinacol rearrangements); one drawn the other way is usually backwards.",
         'species cation = "[CH3:1][C+:2]([CH3:5])[CH2:3][CH3:6]"\n'
         'step "hydride shift"\n'
         '    C3-H -> C2-H(C3)   # tertiary C2+ to secondary C3+: uphill\n'
         'end'),
    Code("AR517", WARNING, "hydroxide or alkoxide leaving in acid",
         "A bond from carbon, or from nitrogen (an oxime's or a hydroxylamine's N-O, as in a Beckmann step), "
         "to oxygen breaks, pushed by a neighbour, and the oxygen leaves as hydroxide "
         "or an alkoxide while a strong acid (H3O+ or another oxonium ion, a hydrogen halide that no free "
         "amine makes a salt of, a sulfonic, sulfuric, perchloric or nitric acid, TFA) is present, or is "
         "made beside it in the same step. In "
         "acid the oxygen is protonated first and leaves as water or an alcohol (common practice: the "
         "acid-catalysed ester formation and acetal hydrolysis); hydroxide beside H3O+ means that proton "
         "transfer is missing.",
         'species intermediate = "[CH3:1][C:2]([OH:3])([OH:4])[O:5]C"\n'
         'species acid = "[OH3+:6]"\n'
         'step "loss of water"\n'
         '    :O3 -> C2=O3\n'
         '    C2-O4 -> O4   # hydroxide leaves beside H3O+: protonate O4 first\n'
         'end'),
    Code("AR518", WARNING, "proton released with no base to take it",
         "A step breaks a bond to a hydrogen, its pair staying on the other atom or going into a new "
         "bond, and no arrow from a base ends at the hydrogen: it is left a bare proton. In solution a "
         "proton is always handed to a base (the solvent, water, the acid's counter-ion; common "
         "practice). Writing \"-H+\" is a shorthand; the hint names a base present to take it, or one "
         "to bring in with `uses`. A proton written as [H+] and used as an acid is not judged.",
         'species alcohol = "[CH3:1][CH:2]([CH3:3])[OH2+:4]"\n'
         'step "E1, loss of a proton"\n'
         '    C1-H -> C1=C2   # and no base: add `:O5 -> H(C1)` with water brought in\n'
         '    C2-O4 -> O4\n'
         'end'),
    Code("AR519", WARNING, "shift between atoms that are not neighbours",
         "A step moves a hydrogen or a carbon group with its pair from one atom to an electron-poor atom "
         "of the same molecule that is not its neighbour: a carbocation, or an atom whose leaving group "
         "departs in the same step. Hydride and alkyl shifts in cations, and migrations to an atom losing "
         "its leaving group, are 1,2 (common practice: the Wagner-Meerwein, pinacol, Baeyer-Villiger and "
         "Beckmann rearrangements); a suprafacial thermal [1,3]-shift of hydrogen is forbidden by the "
         "Woodward-Hoffmann rules. The message counts the atoms between; a longer shift is written as "
         "successive 1,2-shifts (a transannular shift across a medium ring is known). A pericyclic step "
         "is not judged, nor a group passed from or to a metal or metalloid across one bridging atom (a "
         "transmetalation, a sigma-bond metathesis).",
         'species cation = "[CH3:1][CH+:2][CH2:3][CH:4]([CH3:5])[CH3:6]"\n'
         'step "hydride shift"\n'
         '    C4-H -> C2-H(C4)   # C4 is not C2\'s neighbour: two 1,2-shifts, through C3\n'
         'end'),
    Code("AR520", WARNING, "substitution at a tertiary carbon in one step",
         "A nucleophile from another molecule bonds to an sp3 carbon that holds three carbon groups while "
         "a leaving group departs from it in the same step: an SN2 at a tertiary centre. The backside is "
         "too crowded for it (common practice; Clayden: tertiary substrates react by SN1, through the "
         "carbocation, or eliminate by E2). The opening of a three-membered ring (an epoxide, an "
         "aziridinium, episulfonium or bromonium ion), a ring closure, a 1,2-shift and a nucleophile "
         "the leaving group itself delivers (SNi) are not judged.",
         'species bromide = "C[C:1](C)(C)[Br:2]"\n'
         'species hydroxide = "[OH-:3]"\n'
         'step "substitution"\n'
         '    :O3 -> C1   # tert-butyl bromide: let Br2 leave first, then O3 adds (SN1)\n'
         '    C1-Br2 -> Br2\n'
         'end'),
    Code("AR521", WARNING, "pericyclic step forbidden under heat",
         "A pericyclic step (every arrow from a bond to a bond, round a closed loop) of first-row atoms "
         "moves 4 electrons (or 8) where the Woodward-Hoffmann rules forbid it thermally: two pi bonds "
         "joined into a four-membered ring in one step (a [2+2] cycloaddition of two alkenes, allowed "
         "photochemically), or a hydrogen passed from one end of a three-atom array to the other (a "
         "[1,3]-H shift, as in a keto-enol tautomerisation drawn in one step; it goes by two proton "
         "transfers, common practice). A step written `over` or `under` light (\"hv\", \"light\", "
         "\"photo\", \"UV\") is not judged, nor is a partner with a cumulene centre (a ketene, an "
         "allene, an isocyanate: the antarafacial component), an array holding boron or an atom beyond "
         "the second period (hydroboration, a Wittig oxaphosphetane), a 4-electron electrocyclic step "
         "(conrotatory, allowed), a [1,3]-shift of carbon or a cycloreversion.",
         'species a = "[CH2:1]=[CH2:2]"\n'
         'species b = "[CH2:3]=[CH2:4]"\n'
         'step "[2+2]" under "heat"   # photochemical only: write over "hv"\n'
         '    C1=C2 -> C2-C3\n'
         '    C3=C4 -> C4-C1\n'
         'end'),
    Code("AR522", WARNING, "hydroxide or alkoxide leaving in a concerted E2",
         "A base takes a proton whose C-H pair makes a new C=C in the same step as hydroxide or an "
         "alkoxide leaves the other end of it: a concerted E2 with a leaving group too poor for one step. "
         "In base the proton goes first and the carbanion (an enolate, beside a carbonyl) pushes the group "
         "out in the next step: an E1cB, as in an aldol dehydration (common practice; Clayden, from "
         "memory). In acid the group is protonated first and leaves as water or an alcohol. A carboxylate "
         "or a phenoxide leaving is not judged.",
         'species aldol = "[CH3:1][C:2](=[O:3])[CH2:4][CH2:5][OH:6]"\n'
         'species base = "[OH-:7]"\n'
         'step "dehydration"   # take H(C4) first (the enolate), then let it push O6 out\n'
         '    :O7 -> H(C4)\n'
         '    C4-H -> C4=C5\n'
         '    C5-O6 -> O6\n'
         'end'),
    Code("AR523", WARNING, "allene in a small ring",
         "A step leaves a carbon with two double bonds (an allene) inside a ring of eight or fewer atoms. "
         "An allene's two pi bonds stand at right angles and its three carbons in a line, which a small "
         "ring cannot give (common practice: cyclohexa-1,2-diene lives for microseconds; from memory). "
         "Most often a proton was taken from the wrong carbon: an arenium ion loses the proton on its sp3 "
         "carbon. An allene the species was written with is not judged.",
         'species arenium = "[CH:1]1=[CH:2][CH+:3][CH:4]=[CH:5][CH2:6]1"\n'
         'species water = "[OH2:7]"\n'
         'step "deprotonation"   # the proton to take is on C6, the sp3 carbon\n'
         '    :O7 -> H(C2)\n'
         '    C2-H -> C2=C3\n'
         'end'),
    Code("AR524", WARNING, "carbene made from a C-H",
         "A carbon keeps the pair of one of its C-H bonds (the proton taken or passed on) and in the same "
         "step loses the pair of another of its bonds, ending neutral with two bonds and a lone pair: a "
         "carbene made from a carbon that had no lone pair. A carbon that loses a proton becomes a "
         "carbanion first, and only a carbanion lets a group go to leave a carbene, as CCl3- gives "
         "dichlorocarbene (an alpha elimination; Clayden, from memory). Most often a hydrogen was taken "
         "from the wrong carbon: an ene reaction moves the allylic hydrogen. Carbenes made otherwise (a "
         "diazo compound losing nitrogen, a photolysis) are not judged, nor steps under light.",
         'species ene = "[CH2:1]=[C:2]([H:10])[CH3:3]"\n'
         'species enophile = "[CH2:4]=[CH2:5]"\n'
         'step "ene"   # the hydrogen that moves is on C3, the allylic carbon\n'
         '    C1=C2 -> C1-C4\n'
         '    C4=C5 -> C5-H10\n'
         '    C2-H10 -> C2\n'
         'end'),
    Code("AR525", WARNING, "substitution at a carbonyl or thiocarbonyl carbon in one step",
         "A nucleophile bonds to the carbon of a C=O (an ester, an acid chloride or anhydride, an amide, "
         "an activated acid; or the C=S of a thioester or thionoester) while a leaving group departs from that carbon in the same step, the C=O "
         "kept: a substitution at a carbonyl carbon with no tetrahedral intermediate. Nucleophilic acyl "
         "substitution goes by addition to the C=O, its pi pair going onto the oxygen, then loss of the "
         "leaving group as the oxygen's pair re-forms the C=O (common practice; Clayden, from memory). "
         "A step that moves the C=O pair (the addition or the collapse), a pericyclic step, a carbon "
         "with two double bonds or a triple bond (a ketene, an isocyanate, CO2, an acylium ion), an "
         "SN2 at an sp3 carbon and a C=N or C=C carbon are not judged.",
         'species ester = "[CH3:1][C:2](=[O:3])[O:4][CH3:5]"\n'
         'species hydroxide = "[OH-:6]"\n'
         'step "substitution"   # add first (C2=O3 -> O3), then let O3 push O4 out\n'
         '    :O6 -> C2\n'
         '    C2-O4 -> O4\n'
         'end'),
    Code("AR526", WARNING, "proton passed round a four-membered ring",
         "An atom takes a proton, in one step, from an atom of its own molecule two bonds away (both "
         "bonded to one atom that the step changes): a four-membered cyclic proton transfer, as in an "
         "imidic acid drawn turning into its amide by the N taking the O-H proton itself. The "
         "four-membered path is strained and "
         "slow; a tautomerisation between 1,3-related atoms goes by way of the solvent or an acid or base, "
         "two proton transfers (common practice: computed barriers for formimidic acid to formamide are "
         "about 45-50 kcal/mol direct against about 20 with one water, from memory). A proton passed "
         "inside one molecule goes round six atoms (an ene reaction, a beta-keto acid's decarboxylation). "
         "A two-arrow [1,3]-H shift is AR521's, and a hydride or a hydrogen atom that moves is not judged, "
         "nor a step under light, nor what textbooks write as shorthand for a transfer by way of the "
         "solvent: a proton handed across an sp3 carbon the step leaves alone (a tetrahedral "
         "intermediate's O- taking its own N+-H), one taken off a cation, or one taken by a group as "
         "it leaves. It warns too where an O-H, N-H or S-H adds across a C=C in one step (X bonds to one "
         "carbon as the pi pair takes its proton at the other): the addition goes by way of an acid, "
         "the carbon protonated first; a hydride added so (hydroboration) is not judged.",
         'species imidic = "C[C:1](=[NH:2])[OH:3]"\n'
         'step "tautomerisation"   # by way of water: O3 gives its proton, N2 takes one\n'
         '    :N2 -> H(O3)\n'
         '    O3-H -> C1=O3\n'
         '    C1=N2 -> N2\n'
         'end'),
    Code("AR527", WARNING, "ring closure across an arene's para or meta positions",
         "A step closes a ring through two atoms of one six-membered aromatic ring that stand para (1,4) "
         "or meta (1,3) to each other, with a bridge too short to span them: the ring of an [n]para- or "
         "[n]metacyclophane, whose arene must bend out of plane. [n]Paracyclophanes and "
         "[n]metacyclophanes with fewer than five bridge atoms are not isolable, met only as transient "
         "intermediates (from memory). Most often the arene was drawn attacking from the wrong carbon: "
         "the closure that makes a fused ring goes to the carbon ortho to the bridge (a Friedel-Crafts, "
         "Pictet-Spengler or Skraup closure). A pericyclic step is not judged.",
         'species aldehyde = "[CH:1]1=[CH:2][C:3](CCC[CH:10]=[OH+:11])=[CH:4][CH:5]=[CH:6]1"\n'
         'step "ring closure"   # C6 is para to the chain: close onto C2 or C4, ortho\n'
         '    C5=C6 -> C6-C10\n'
         '    C10=O11 -> O11\n'
         'end'),
    Code("AR528", WARNING, "carbocation left beside an anion's lone pair",
         "A step leaves a carbocation bonded to an O-, N- or S- that keeps its lone pair: the group that "
         "left the carbon (a hydride, a leaving group) went without the anion's pair pushing in to make "
         "C=O, C=N or C=S in the same step (a tetrahedral intermediate collapsing; the hydride transfer "
         "of a Cannizzaro or a Meerwein-Ponndorf-Verley reduction). C+ beside O- is the charge-separated "
         "resonance form of a C=O, not an intermediate (common practice). A `resonance` step and a cation "
         "there before the step are not judged.",
         'species adduct = "[O-:2][CH2:1][OH:5]"\n'
         'species aldehyde = "c1ccccc1[CH:3]=[O:4]"\n'
         'step "hydride transfer"   # add `:O2 -> C1=O2`: O2 pushes the hydride out\n'
         '    C1-H -> C3-H(C1)\n'
         '    C3=O4 -> O4\n'
         'end'),
    Code("AR529", WARNING, "C-H pair bonding as its proton is taken",
         "A C-H bond's pair makes a new bond to an electrophile while a base takes that hydrogen in the "
         "same step: the enol or enolate the C-H gives is skipped. A C-H pair is no nucleophile: the "
         "proton goes first and the enol's C=C (or the enolate) bonds in a step of its own (common "
         "practice: the Mannich reaction and the aldol go through the enol or enolate). A pericyclic step "
         "(an ene reaction), a hydride that moves with its pair and a carbene inserting into the C-H "
         "are not judged.",
         'species ketone = "[CH3:5][C:6](=[OH+:7])C"\n'
         'species iminium = "C[N+:1](C)=[CH2:2]"\n'
         'species water = "[OH2:10]"\n'
         'step "C-H adds"   # the enol first: `:O10 -> H(C5)`, `C5-H -> C5=C6`, `C6=O7 -> O7`\n'
         '    :O10 -> H(C5)\n'
         '    C5-H -> C5-C2\n'
         '    C2=N1 -> N1\n'
         'end'),
    Code("AR530", WARNING, "unpaired electron in a mechanism of pair arrows",
         "A species is written with an atom that carries an unpaired electron (an odd number of "
         "non-bonding electrons: a radical, as written), yet no arrow of the mechanism moves a single "
         "electron. Pair arrows never change an atom's electron parity, so such a radical is most often "
         "an ion whose charge was left out of the SMILES: a cuprate written Me2Cu (copper(II)) for the "
         "Me2Cu- of Me2CuLi, an alkoxide written [O] for [O-]; a cation one hydrogen short (hydronium "
         "written [OH2+]) is offered the hydrogen. A mechanism with a fishhook or an electron "
         "transfer is radical chemistry and is not judged; nor is a d- or f-block metal bonded to no "
         "carbon, a paramagnetic salt drawn as a Lewis acid or oxidant (FeBr3, CuCl2).",
         'species cuprate = "[CH3:1][Cu:2][CH3:3]"   # Me2CuLi: write [Cu-:2]\n'
         'species lithium = "[Li+:4]"\n'
         'species enone = "[O:5]=[C:6]1[CH:7]=[CH:8]CCC1"\n'
         'step "conjugate addition"\n'
         '    C1-Cu2 -> C1-C8\n'
         '    C7=C8 -> C6=C7\n'
         '    C6=O5 -> O5\n'
         'end'),
    Code("AR531", WARNING, "proton taker left an onium beside an ate",
         "A step in which an atom takes a proton with its lone pair leaves it positive, bonded to an atom "
         "the same step leaves negative: an onium beside an ate, the charge-separated form of the bond "
         "between them, where a neutral pair of products was meant. At a hypervalent centre that takes a "
         "leaving pair (iodine(V) becoming iodine(III) in an IBX oxidation) the proton goes to the oxygen "
         "of its X=O, whose pi pair returns to that oxygen in the same step (Kurti-Czako, from memory); a "
         "ligand's oxygen taking it is left O+ beside I-. A `resonance` step is not judged.",
         'species ester = "[O:1]=[I:2]1([O:6][CH:5](C)C)[O:4]C(=O)c2ccccc21"\n'
         'step "elimination"   # the I=O oxygen takes it: `:O1 -> H(C5)` with `I2=O1 -> O1`\n'
         '    :O4 -> H(C5)\n'
         '    C5-H -> C5=O6\n'
         '    O6-I2 -> I2\n'
         'end'),
    Code("AR532", WARNING, "sigma complex quenched without rearomatising",
         "An electrophile bonded to a carbon of an aromatic ring (RDKit's perception judging the state "
         "before), leaving that carbon sp3 with its hydrogen and the ring a cation: a sigma complex (an "
         "arenium ion, a 2H-pyrrolium, a 3H-indolium). A later step takes the cation away some other way "
         "(a base takes the ring N-H's proton, a nucleophile bonds to the ring) while the sp3 carbon keeps "
         "its hydrogen, and the mechanism ends with that ring not aromatic. An electrophilic aromatic "
         "substitution ends with a base taking the proton on the sp3 carbon, which restores the ring "
         "(common practice; Clayden, from memory). Not judged: a proton as the electrophile (a ring "
         "protonated at carbon is trapped by a nucleophile as an indole dimerises in acid), an sp3 "
         "carbon with no hydrogen (an ipso attack), a sigma complex with no cation (a phenoxide's "
         "dienone, a Diels-Alder of furan, a Birch reduction), a nucleophile adding to an arene "
         "(Chichibabin, SNAr), and a ring aromatic again by the end.",
         'species pyrrole = "[NH:1]1[CH:2]=[CH:3][CH:4]=[CH:5]1"\n'
         'species acylium = "[CH3:6][C:7]#[O+:8]"\n'
         'species acetate = "CC(=O)[O-:9]"\n'
         'step "attack at C2"\n'
         '    :N1 -> N1=C5\n'
         '    C4=C5 -> C3=C4\n'
         '    C2=C3 -> C2-C7\n'
         '    C7#O8 -> O8\n'
         'end\n'
         'step "rearomatisation"   # take the proton on C2 instead: `:O9 -> H(C2)`\n'
         '    :O9 -> H(N1)\n'
         '    N1-H -> N1\n'
         'end'),
    Code("AR533", WARNING, "enol ether or enamine bonded at the wrong carbon",
         "A C=C pair takes a proton, or bonds to another electrophile (a Michael acceptor, an alkyl "
         "halide), at the carbon that bears an O, N or S with a lone pair (an enol "
         "ether, an enamine, a vinyl sulfide), leaving the other carbon a carbocation with nothing "
         "beside it to spread the charge. Bonded at that other carbon, the electrophile would leave the "
         "cation beside the heteroatom, whose lone pair makes it an oxocarbenium or iminium ion: such "
         "alkenes react at the carbon away from the heteroatom (common practice; the "
         "tetrahydropyranyl ether from dihydropyran, the Stork enamine reactions, Clayden, from memory). A cation left allylic, "
         "benzylic or beside a lone pair is not judged; a primary one (an acetone enamine's CH2) is AR533's, not AR511's.",
         'species dhp = "[O:1]1[CH:2]=[CH:3][CH2:4][CH2:5][CH2:6]1"\n'
         'species acid = "[OH3+:7]"\n'
         'step "protonation"\n'
         '    C2=C3 -> C2-H(O7)   # protonate C3: the cation on C2 beside O1\n'
         '    O7-H -> O7\n'
         'end'),
    Code("AR534", WARNING, "alkoxide pushed out of an acetal unprotonated",
         "Hydroxide or an alkoxide leaves a carbon pushed out by a neighbouring neutral oxygen's lone pair, "
         "which becomes an oxocarbenium ion: an acetal, ketal, glycoside or hemiacetal opened with its "
         "leaving oxygen unprotonated. Acetals are stable to base; they open only in acid, the leaving "
         "oxygen protonated first or as it leaves (a glycosidase's general acid), so that it leaves as an "
         "alcohol (common practice; Clayden, from memory). Likewise a glycosyl donor's leaving group that "
         "leaves as an anion whose conjugate acid has a pKa of 3 or more (a carboxylate from a glycosyl "
         "ester, 4.8; a trichloroacetimidate as the amide's anion, its pair passed on to N): it leaves "
         "only once activated, protonated or bonded to a Lewis acid (TMSOTf or TfOH, BF3.OEt2; Schmidt, "
         "from memory). A sulfonate, a halide or a phosphate leaving as a monoanion (a glycosyl "
         "dialkyl phosphate's, conjugate acid pKa ~1-2) leaves unaided (a glycosyl triflate ionises); a "
         "phosphate dianion (pKa ~6-7: UDP from a sugar nucleotide) is activated by a metal ion or a general "
         "acid (Kumler & Eiler 1943 for the pKa values, from memory). A nitrogen's push (a "
         "carbinolamine giving an iminium ion and hydroxide) and an anion's (a tetrahedral intermediate "
         "collapsing) are not judged, nor a phenoxide leaving, a carbon with a third heteroatom (an "
         "ester's neutral tetrahedral intermediate) or an epoxide opening (the Rubottom oxidation).",
         'species acetal = "[O:1]1CCCC[CH:2]1[O:3]C"\n'
         'step "ring opening"\n'
         '    :O1 -> C2=O1\n'
         '    C2-O3 -> O3   # methoxide left unprotonated: protonate O3 first (in acid)\n'
         'end'),
    Code("AR535", WARNING, "hydrogen atom taken uphill",
         "A radical takes a hydrogen atom (three fishhooks) across a bond much stronger than the one it "
         "makes: the bond dissociation enthalpy of the H-Y bond broken less that of the X-H bond made is "
         "more than 15 kcal/mol. A radical chain runs through steps no more uphill than that (a bromine "
         "atom takes a primary C-H, about 13 uphill, slowly; common practice, from memory): a bromine "
         "atom does not take a vinylic C-H (24 uphill), nor a tin radical a C-H. Values by substructure "
         "(Blanksby & Ellison, Acc. Chem. Res. 2003; Luo's handbook for Sn-H and Si-H; from memory); a "
         "bond not in the table is not judged.",
         'species alkene = "[CH2:1]=[CH2:2]"\n'
         'species br = "[Br:3]"\n'
         'step "H abstraction"\n'
         '    .Br3 ~> Br3-H(C1)   # a vinylic C-H (~111) for H-Br (87.5): take an allylic H\n'
         '    C1-H ~> Br3-H(C1)\n'
         '    C1-H ~> C1\n'
         'end'),
    Code("AR536", WARNING, "hydrogen atom set free",
         "A step splits a bond to a hydrogen one electron each way and no radical takes the hydrogen: "
         "it is left a free hydrogen atom. In solution radicals abstract hydrogen (X* + H-R gives X-H + "
         "R*); they do not set hydrogen atoms free, and H* carries no chain: nothing bonds to it to pay "
         "for the bond it left (common practice; C-H, O-H and S-H bonds of 87-111 kcal/mol, Blanksby & "
         "Ellison 2003, from memory). Most often the radical bonds to the atom the hydrogen leaves (a "
         "chlorine atom onto methane's carbon, SH2) where it should take the hydrogen. A step under light "
         "(a photolysis) is not judged. Which hydrogen a radical takes is AR535's.",
         'species methane = "[CH4:1]"\n'
         'species chlorine = "[Cl:2]"\n'
         'step "propagation"\n'
         '    .Cl2 ~> Cl2-C1\n'
         '    C1-H ~> Cl2-C1\n'
         '    C1-H ~> H(C1)   # H* set free: Cl2 takes H(C1) instead, giving HCl and CH3*\n'
         'end'),
    Code("AR537", WARNING, "aromatic ring oxygen used as a nucleophile",
         "The lone pair of a furan-type oxygen (two ring bonds, in a ring RDKit perceives as aromatic) "
         "makes a bond to an atom outside its ring. That pair is part of the ring's aromatic sextet: "
         "bonded, it makes an oxonium ion and gives the aromaticity up. Furans react at a ring carbon "
         "next to the oxygen (C2 or C5) with electrophiles, and as dienes in cycloadditions (Joule & "
         "Mills, Heterocyclic Chemistry; from memory). A pyrrole-type nitrogen (an indole's N-Mannich "
         "reaction) and a thiophene's sulfur (oxidised at S) are not judged.",
         'species furan = "[O:1]1[CH:2]=[CH:3][CH:4]=[CH:5]1"\n'
         'species acylium = "C[C:6]#[O+:7]"\n'
         'step "acylation"\n'
         '    :O1 -> O1-C6   # the ring O\'s pair is aromatic: attack at C2 (`C2=C3 -> C2-C6`)\n'
         '    C6#O7 -> O7\n'
         'end'),
    Code("AR538", WARNING, "carbon nucleophile adding to a carboxylate",
         "A carbon nucleophile (a Grignard reagent, an enolate or enol, cyanide, an ylide) bonds to the carbon of a "
         "carboxylate ion or its metal salt (a C=O and an O- or O-metal, the rest carbon or hydrogen). The "
         "charge spread over both oxygens makes a carboxylate a very poor electrophile: a Grignard carboxylation "
         "stops at the carboxylate, and an enolate does not add to one (common practice; Clayden, from memory). "
         "An organolithium adds, to a lithium carboxylate, giving the gem-dialkoxide that work-up turns into a "
         "ketone (Jorgenson, Org. React. 1970, from memory): a carbon bonded to lithium, or a carbanion with "
         "nothing beside it to hold the charge written apart from Li+, is not judged; nor is an organosodium or "
         "organopotassium (or Rb, Cs), more ionic and more reactive still (Schlosser, Organometallics in "
         "Synthesis: A Manual, from memory). Nor are a hydride or a heteroatom nucleophile, a carbonate's or "
         "carbamate's carbon and CO2.",
         'species grignard = "[CH3:1][Mg:2][Br:3]"\n'
         'species acetate = "C[C:4](=[O:5])[O-:6]"\n'
         'step "addition"\n'
         '    C1-Mg2 -> C1-C4   # no Grignard adds to a carboxylate: use an ester\n'
         '    C4=O5 -> O5\n'
         'end'),
    Code("AR539", WARNING, "carbon nucleophile bonded to a hypohalite's oxygen",
         "A carbon nucleophile (an alkene's C=C pair, a carbanion) bonds to the oxygen of an O-Cl, O-Br or O-I "
         "bond (HOCl, HOBr, tert-butyl hypochlorite) while the O-halogen pair goes to the halogen. Oxygen is the "
         "more electronegative end (Pauling: O 3.44, Cl 3.16, Br 2.96, I 2.66; memory), so the halogen is the "
         "electrophile: an alkene takes the halogen and water or hydroxide adds to the cation (halohydrin "
         "formation, the Pinnick oxidation's HOCl scavenged by an alkene; common practice, Clayden, from memory). "
         "Not judged: a ring closure (an enolate closing onto its own O-Cl, as in an enone's epoxidation by "
         "hypochlorite), a heteroatom nucleophile, and an O-F bond (HOF transfers its oxygen; memory).",
         'species alkene = "C[C:1](C)=[CH2:2]"\n'
         'species hocl = "[OH:3][Cl:4]"\n'
         'step "addition"\n'
         '    C1=C2 -> C2-O3   # the alkene takes Cl: `C1=C2 -> C2-Cl4`, `Cl4-O3 -> O3`\n'
         '    Cl4-O3 -> Cl4\n'
         'end'),
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
         "four-membered one still draws AR501). A closure of five or more atoms that Baldwin disfavours "
         "onto an oxocarbenium or iminium ion (dioxolane formation, 5-endo-trig) is a note here, not "
         "AR502: such closures are routine (common practice); so is a disfavoured aldol written "
         "`reversible` and carried on by a later step that breaks its C-O bond (hexane-2,5-dione's "
         "condensation). A radical's 6-endo-trig closure onto an alkene, favoured "
         "by Baldwin, names the 5-exo closure onto the same alkene, which radicals usually prefer (the "
         "hex-5-enyl radical about 98:2; Beckwith, from memory). A 5-endo opening of an epoxide (its "
         "exo rival a strained four-membered ring) is a note.",
         'species bromobutoxide = "[O-:1][CH2:2][CH2:3][CH2:4][CH2:5][Br:6]"\n'
         'step "ring closure"\n'
         '    :O1 -> C5   # tetrahydrofuran: 5-exo-tet, favoured (a note, not a fault)\n'
         '    C5-Br6 -> Br6\n'
         'end'),
    Code("AR602", NOTE, "stereocentres",
         "Stereocentres or stereogenic double bonds made or lost in a step, and how many "
         "stereoisomers the product can have when the mechanism controls none of them. A step's note "
         "names a new element when the step configures it or it lasts to the product or to a written "
         "checkpoint, and a lost one when it was configured (written, or set by a step): losing it is a "
         "racemisation or scrambling risk. An element made without configuration and lost again before "
         "either (a transient enolate's E/Z, a tetrahedral intermediate's centre) is left out; "
         "`arrows trace --stereo` lists every change. A centre that "
         "is stereogenic only in one resonance structure (the sigma complex of an aromatic "
         "substitution) is not reported. A configuration written in a species is carried through "
         "the steps (inverted by a backside substitution, kept by a 1,2-shift). New centres made by a "
         "concerted, cyclic addition to both atoms of a double bond of known geometry (written E or Z, "
         "or in a ring of up to seven atoms): a peracid epoxidation, a bromonium ion, hydroboration, a "
         "Diels-Alder dienophile, get the configuration of a syn addition, both new bonds on one face; "
         "a bromonium ion opened from the back then gives the anti product. The ends of a "
         "Diels-Alder diene written E or Z at both ends are configured the same way (suprafacial: "
         "outside groups cis); beside a configured dienophile each pair is fixed within itself and "
         "endo or exo stays open (both counted, either may be written). An electrocyclic closure of a chain whose end double bonds are written E or Z "
         "configures its termini as the Woodward-Hoffmann rules turn them (under heat 4n electrons "
         "conrotatory, 4n+2 disrotatory; under light the reverse). A concerted elimination "
         "across two configured centres sets the new double bond's geometry: anti-periplanar (E2), or "
         "syn when the leaving group takes the hydrogen (a Cope elimination). An open-chain Cope or "
         "Claisen whose two chairs give one product gets it; where they give two (the racemic "
         "3,4-dimethylhexa-1,5-diene: (E,E) and (Z,Z)), the end count is of the stereoisomers the chairs "
         "allow. Other new centres (an aldol's, an addition to C=O) are counted as free.",
         'species aldehyde = "[CH3:1][CH:2]=[O:3]"\n'
         'species cyanide = "[C-:4]#[N:5]"\n'
         'step "cyanide adds"\n'
         '    :C4 -> C2   # C2 becomes a stereocentre, formed without control (a note)\n'
         '    C2=O3 -> O3\n'
         'end'),
    Code("AR603", WARNING, "configuration written otherwise",
         "A checkpoint or the product is written with a configuration (@, @@, / or \\) that the steps "
         "do not give: a diastereomer of the derived structure, or its enantiomer when a species was "
         "written with a configured centre. Only pieces of the same constitution are compared, element "
         "by element: a centre or double bond the steps leave unset (an aldol's, a Felkin addition's) "
         "is not judged, the others are; an enantiomer of a product formed as the racemate is no "
         "mismatch. A centre a step cleared (an enolate, an oxazolone's aromatic anion, an SN1's planar "
         "cation) and no later step configured, once no chiral molecule is left, forms as the "
         "racemate: written with the configuration it had before that step (retention claimed; for "
         "the SN1, the nucleophile in the leaving group's place) it is warned too; written the other "
         "way (a racemase's turnover, its chiral site not written; an SN1's inversion, which an ion "
         "pair can favour) it is not judged.",
         'species bromide = "CC[C@@H:1](C)[Br:2]"\n'
         'species hydroxide = "[OH-:3]"\n'
         'step "backside attack"\n'
         '    :O3 -> C1\n'
         '    C1-Br2 -> Br2\n'
         'end\n'
         'product "CC[C@@H](C)O.[Br-]"   # (R) kept; the SN2 inverts C1 to (S)'),
    Code("AR604", WARNING, "ring elimination that cannot be periplanar",
         "A concerted elimination across a ring bond (a ring of five to seven), both carbons "
         "configured, takes a hydrogen that cannot be periplanar with the leaving group: an E2 needs "
         "them trans on the ring (trans-diaxial in a cyclohexane), a syn elimination in which the "
         "leaving group takes the hydrogen itself (a Cope elimination) needs them cis. Faces are "
         "read off an RDKit 3D model (common practice: menthyl chloride's E2 gives only the alkene "
         "its trans-diaxial hydrogen allows).",
         'species bromide = "[CH3:9][C@@H:2]1CCCC[C@H:1]1[Br:3]"\n'
         'species base = "CC[O-:4]"\n'
         'step "E2"\n'
         '    :O4 -> H(C2)   # the C2-H is cis to Br3: no anti-periplanar hydrogen there\n'
         '    C2-H -> C2=C1\n'
         '    C1-Br3 -> Br3\n'
         'end'),
    Code("AR605", WARNING, "[3,3] shift product that no chair gives",
         "A checkpoint or the product of a Cope or Claisen rearrangement is written with double-bond "
         "geometry or new stereocentres that neither chair transition state gives. An open-chain [3,3] "
         "shift goes through a chair: a group on a breaking-bond carbon stands equatorial (its new double "
         "bond E) or axial (Z), and a terminus's group trans to the chain equatorial, so "
         "meso-3,4-dimethylhexa-1,5-diene gives (E,Z)-octa-2,6-diene and the (3R*,4R*) diene (E,E) or "
         "(Z,Z) (Doering & Roth 1962; from memory). Positions written without configuration may take "
         "either place. Only arrays of C, N, O and divalent sulfur (a thio-Claisen's) outside any ring "
         "are judged: a ring can force a boat.",
         'species diene = "[CH2:1]=[CH:2][C@@H:3](C)[C@@H:4](C)[CH:5]=[CH2:6]"   # meso\n'
         'step "[3,3] shift" over "heat"\n'
         '    C1=C2 -> C1-C6\n'
         '    C3-C4 -> C2=C3\n'
         '    C5=C6 -> C4=C5\n'
         'end\n'
         'product "C/C=C/CC/C=C/C"   # (E,E): a boat; the chair gives (E,Z)'),
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


def cannot_read(name: str, exc: Optional[OSError] = None) -> Diagnostic:
    """AR100 for an input that cannot be opened: every command words a missing file (exc None or
    FileNotFoundError) alike, so this is the one place that says it."""
    if exc is None or isinstance(exc, FileNotFoundError):
        return Diagnostic("AR100", "cannot read file: no such file or folder", Location(name, 1, 1),
                          hint="check the path; a relative path starts from the folder the command runs in")
    return Diagnostic("AR100", f"cannot read file: {exc.strerror or exc}", Location(name, 1, 1),
                      hint="check the path and permissions")


class MechanismError(Exception):
    """Raised when a file cannot be turned into a Mechanism at all; carries its diagnostics."""

    def __init__(self, diagnostics: list[Diagnostic]):
        self.diagnostics = diagnostics
        super().__init__("\n".join(d.to_text() for d in diagnostics))
