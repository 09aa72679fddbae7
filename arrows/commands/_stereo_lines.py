"""The lines `arrows trace --stereo` prints: stereo elements made or lost per step, relations
between stereo-specified checkpoint structures, and the stereoisomers of the final state."""
from __future__ import annotations

from ..checks.stereo import final_stereo, step_stereo
from ..checks.written_stereo import forms_racemate
from ..judgement.stereo import CENTRE, cip_labels, describe, is_chiral, pairwise_relations
from ..trace import StepTrace, Trace


def _names(elements, label) -> str:
    centres = [describe(e, label) for e in elements if e.kind == CENTRE]
    bonds = [describe(e, label) for e in elements if e.kind != CENTRE]
    parts = ([f"stereocentres {', '.join(centres)}" if len(centres) > 1 else f"stereocentre {centres[0]}"]
             if centres else [])
    parts += [f"double bond{'s' if len(bonds) > 1 else ''} {', '.join(bonds)} (E/Z)"] if bonds else []
    return "; ".join(parts)


def _relations(smiles: list[str]) -> list[str]:
    fragments = [f for s in smiles for f in s.split(".")]
    return [f"  stereo   {a} and {b}: {r}" for a, b, r in pairwise_relations(fragments)]


def step_lines(st: StepTrace) -> list[str]:
    made, lost = step_stereo(st)
    label = st.after.label if st.after is not None else st.before.label
    lines = []
    if made:
        lines.append(f"  stereo   new {_names(made, label)}")
    if lost:
        lines.append(f"  stereo   lost {_names(lost, label)}")
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
        elif p.stereoisomers == 1 and any(mark in p.smiles for mark in "@/\\"):   # a configured centre or double bond
            count = "one stereoisomer, as the steps configure it"
            if racemate and is_chiral(p.smiles):
                count += "; formed as the racemate (no chiral species leads to it)"
        else:
            count = f"{p.stereoisomers} stereoisomer{'s' if p.stereoisomers != 1 else ''} with no stereocontrol"
        lines.append(f"  {p.smiles}: {_names(p.elements, trace.final.label)}; {count}")
    if not products:
        lines.append("  no stereocentre or stereogenic double bond in the final state")
    if trace.mechanism.product is not None:
        lines += _relations([trace.mechanism.product.smiles])
    return lines
