"""Stereocentres and stereogenic double bonds made or lost in each step, and how many
stereoisomers of the final product can form when the mechanism controls none of them (AR602)."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Iterator, Optional

from rdkit import Chem

from ..diagnostics import Diagnostic
from ..judgement.stereo import CENTRE, StereoElement, describe, stereo_elements, stereoisomer_count
from ..rdkit_io import canonical
from ..trace import StepTrace, Trace


@dataclass(frozen=True)
class ProductStereo:
    smiles: str
    elements: tuple[StereoElement, ...]
    stereoisomers: Optional[int]     # None: RDKit could not enumerate them


def step_stereo(st: StepTrace, seen: Optional[dict] = None) -> tuple[list[StereoElement], list[StereoElement]]:
    """(made, lost) in one step; `seen` caches the elements of states already perceived (the
    state after one step is usually the state before the next)."""
    if st.after is None:
        return [], []
    seen = {} if seen is None else seen
    old, new = _elements(st.before.mol, seen), _elements(st.after.mol, seen)
    return sorted(new - old), sorted(old - new)


def _elements(mol: Chem.Mol, seen: dict) -> frozenset[StereoElement]:
    if id(mol) not in seen:     # the trace keeps every state alive, so ids stay unique
        seen[id(mol)] = stereo_elements(mol)
    return seen[id(mol)]


def final_stereo(trace: Trace, seen: Optional[dict] = None) -> list[ProductStereo]:
    """Each fragment of the final state (released by-products aside) that has stereo elements,
    with the number of its stereoisomers when no configuration made by the mechanism is fixed;
    `seen` as in step_stereo."""
    final = trace.final
    if final is None:
        return []
    elements = _elements(final.mol, {} if seen is None else seen)
    if not elements:
        return []
    touched = {i for st in trace.steps for i in st.change.touched_atoms}
    out = []
    for indices in Chem.GetMolFrags(final.mol, asMols=False, sanitizeFrags=False):
        if set(indices) & final.released:
            continue
        mine = tuple(sorted(e for e in elements if e.atoms[0] in indices))
        if not mine:
            continue
        keep = sorted(indices)
        fragment = Chem.RWMol(final.mol)
        for i in sorted(set(range(final.mol.GetNumAtoms())) - set(keep), reverse=True):
            fragment.RemoveAtom(i)
        position = {old: new for new, old in enumerate(keep)}
        uncontrolled = [position[i] for i in touched if i in position]
        out.append(ProductStereo(canonical(fragment.GetMol()), mine,
                                 stereoisomer_count(fragment.GetMol(), uncontrolled)))
    return out


def _said(elements: list[StereoElement], label) -> str:
    centres = [describe(e, label) for e in elements if e.kind == CENTRE]
    bonds = [describe(e, label) for e in elements if e.kind != CENTRE]
    parts = []
    if centres:
        parts.append(f"stereocentre{'s' if len(centres) > 1 else ''} {', '.join(centres)}")
    if bonds:
        parts.append(f"stereogenic double bond{'s' if len(bonds) > 1 else ''} {', '.join(bonds)}")
    return " and ".join(parts)


class StereoChanges:
    name = "stereo changes"
    codes = ("AR602",)

    def run(self, trace: Trace) -> Iterator[Diagnostic]:
        seen: dict = {}
        for st in trace.steps:
            made, lost = step_stereo(st, seen)
            if not made and not lost:
                continue
            label = st.after.label
            parts = []
            if made:
                parts.append(f"new {_said(made, label)}")
            if lost:
                parts.append(f"no longer stereogenic: {_said(lost, label)}")
            yield Diagnostic("AR602", "; ".join(parts), st.step.loc, step=st.index,
                             atoms=tuple(label(i) for e in made + lost for i in e.atoms))
        product = self._product_note(trace, seen)
        if product:
            yield product

    def _product_note(self, trace: Trace, seen: dict) -> Optional[Diagnostic]:
        many = [p for p in final_stereo(trace, seen) if (p.stereoisomers or 0) > 1]
        if not many:
            return None
        loc = trace.mechanism.product.loc if trace.mechanism.product else trace.steps[-1].step.loc
        label = trace.final.label
        text = "; ".join(f"{p.smiles} ({_said(list(p.elements), label)}): {p.stereoisomers} stereoisomers can form"
                         for p in many)
        return Diagnostic("AR602", f"with no stereocontrol, {text}", loc, step=len(trace.steps) - 1)
