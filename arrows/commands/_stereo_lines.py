"""The lines `arrows trace --stereo` prints: stereo elements made or lost per step, each with its
configuration, relations between stereo-specified checkpoint structures, and the stereoisomers of
the final state."""
from __future__ import annotations

from rdkit import Chem

from ..checks.stereo import chair_allowance, chairs_named, final_stereo, step_stereo
from ..checks.chair_shifts import forms_racemate
from ..judgement.stereo import CENTRE, StereoElement, cip_codes, cip_labels, describe, is_chiral, pairwise_relations
from ..trace import StepTrace, Trace

_SET_DIRECTIONS = (Chem.BondDir.ENDUPRIGHT, Chem.BondDir.ENDDOWNRIGHT)


def _configured(mol: Chem.Mol, element: StereoElement) -> bool:
    """Whether the state fixes the element: a chiral tag on the centre; on a double bond, a set
    geometry or (read without sanitizing) a / or \\ beside each end."""
    if element.kind == CENTRE:
        return mol.GetAtomWithIdx(element.atoms[0]).GetChiralTag() != Chem.ChiralType.CHI_UNSPECIFIED
    a, b = element.atoms
    bond = mol.GetBondBetweenAtoms(a, b)
    if bond is not None and bond.GetStereo() != Chem.BondStereo.STEREONONE:
        return True
    return all(any(n.GetBondDir() in _SET_DIRECTIONS for n in mol.GetAtomWithIdx(end).GetBonds()
                   if n.GetIdx() != (bond.GetIdx() if bond is not None else -1)) for end in (a, b))


def _configuration(mol: Chem.Mol, element: StereoElement, codes: dict) -> str:
    """R/S or E/Z as RDKit's CIP labeller gives it; `unset` where the state leaves the element open."""
    if element.kind == CENTRE:
        code = codes.get(("atom", element.atoms[0]))
    else:
        a, b = element.atoms
        code = codes.get(("bond", a, b)) or codes.get(("bond", b, a))
    if code:
        return code
    # (configured, but an intermediate RDKit's labeller cannot read: a radical, an odd cation)
    return "configured, no CIP label" if _configured(mol, element) else "unset"


def _names(elements, label, mol: Chem.Mol) -> str:
    codes = cip_codes(mol)
    def named(e) -> str:
        return f"{describe(e, label)} ({_configuration(mol, e, codes)})"
    centres = [named(e) for e in elements if e.kind == CENTRE]
    bonds = [named(e) for e in elements if e.kind != CENTRE]
    parts = ([f"stereocentres {', '.join(centres)}" if len(centres) > 1 else f"stereocentre {centres[0]}"]
             if centres else [])
    parts += [f"double bond{'s' if len(bonds) > 1 else ''} {', '.join(bonds)}"] if bonds else []
    return "; ".join(parts)


def _relations(smiles: list[str]) -> list[str]:
    fragments = [f for s in smiles for f in s.split(".")]
    return [f"  stereo   {a} and {b}: {r}" for a, b, r in pairwise_relations(fragments)]


def step_lines(st: StepTrace) -> list[str]:
    made, lost = step_stereo(st)
    label = st.after.label if st.after is not None else st.before.label
    lines = []
    if made:
        lines.append(f"  stereo   new {_names(made, label, st.after.mol)}")
    if lost:   # named as they were before the step
        lines.append(f"  stereo   lost {_names(lost, st.before.label, st.before.mol)}")
    if st.after is not None and st.before.configured and st.after.configured:
        # A configured centre the step's bonds reach and that stays one (an SN2's carbon, inverted;
        # a 1,2-shift's migrating carbon, kept): its CIP label before and after, as RDKit assigns it.
        touched = set(st.change.touched_atoms)
        before, after = cip_labels(st.before.mol, touched), cip_labels(st.after.mol, touched)
        for i in sorted(set(before) & set(after)):
            lines.append(f"  stereo   configured centre {label(i)}: ({before[i]}) before, ({after[i]}) after")
    lines += _relations([c.smiles for c in st.step.expects])
    return lines or ["  stereo   no change"]


def final_lines(trace: Trace) -> list[str]:
    lines = ["", "stereo"]
    if trace.final is None:
        return lines + ["  the final state was not derived"]
    products = final_stereo(trace)
    racemate = forms_racemate(trace)
    for p in products:
        if p.stereoisomers is None:
            count = "stereoisomers not counted (RDKit cannot enumerate this structure)"
        elif p.allowed is not None:   # AR602's end count: the chairs of [3,3] shifts narrow the free one
            count = chair_allowance(p) + chairs_named(p)
        elif p.stereoisomers == 1 and any(mark in p.smiles for mark in "@/\\"):   # a configured centre or double bond
            count = "one stereoisomer, as the steps configure it"
            if racemate and is_chiral(p.smiles):
                count += "; formed as the racemate (no chiral species leads to it)"
        else:
            count = f"{p.stereoisomers} stereoisomer{'s' if p.stereoisomers != 1 else ''} with no stereocontrol"
        lines.append(f"  {p.smiles}: {_names(p.elements, trace.final.label, trace.final.mol)}; {count}")
    if not products:
        lines.append("  no stereocentre or stereogenic double bond in the final state")
    if trace.mechanism.product is not None:
        lines += _relations([trace.mechanism.product.smiles])
    return lines
