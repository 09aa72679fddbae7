"""Mechanism -> .mech text. The printed text parses back to an equal Mechanism (locations and
comments aside: the model keeps neither the comments nor the layout of the original file)."""
from __future__ import annotations

import re
from typing import Optional

from .model import STEP_KINDS, Checkpoint, Mechanism, Species, Step

# What the grammar accepts inside quotes and as a name (grammar/mechanism.lark: STRING, NAME).
_STRING_FORBIDDEN = re.compile(r'["\n\r\x00]')   # a CR reads as a line end too (language.parse)
_NAME = re.compile(r"[A-Za-z_][A-Za-z0-9_]*\Z")
INDENT = "    "


class UnprintableMechanism(ValueError):
    """A field holds text the language cannot carry (a double quote or a line break, LF or CR, in a string,
    a species name that is not a name)."""


def quoted(text: str, what: str) -> str:
    if _STRING_FORBIDDEN.search(text):
        raise UnprintableMechanism(f"{what} {text!r} contains a double quote or a line break, "
                                   "which a quoted string of the language cannot hold")
    return f'"{text}"'


def name(text: str) -> str:
    if not _NAME.match(text):
        raise UnprintableMechanism(f"{text!r} is not a usable species name: letters, digits and _, "
                                   "not starting with a digit")
    return text


def _species_line(keyword: str, species: Species) -> str:
    return f"{keyword} {name(species.name)} = {quoted(species.smiles, 'the SMILES of ' + species.name)}"


def _checkpoint(keyword: str, checkpoint: Checkpoint) -> str:
    every = "all " if checkpoint.whole_state else ""
    return f"{keyword} {every}{quoted(checkpoint.smiles, keyword + ' SMILES')}"


def _step_lines(step: Step) -> list[str]:
    if step.kind not in STEP_KINDS:
        raise UnprintableMechanism(f"step {step.label!r} has kind {step.kind!r}; the kinds are {', '.join(STEP_KINDS)}")
    head = f"step {quoted(step.label, 'the step label')}"
    if step.kind != "forward":
        head += f" {step.kind}"
    if step.over is not None:
        head += f" over {quoted(step.over, 'the text over the arrow')}"
    if step.under is not None:
        head += f" under {quoted(step.under, 'the text under the arrow')}"
    body = [_species_line("uses", s) for s in step.uses]
    body += [str(move) for move in step.moves]
    body += [f"releases {atom}" for atom in step.releases]
    body += [_checkpoint("expect", c) for c in step.expects]
    return [head] + [INDENT + line for line in body] + ["end"]


def _optional(keyword: str, text: Optional[str]) -> list[str]:
    return [] if text is None else [f"{keyword} {quoted(text, keyword)}"]


def to_text(mechanism: Mechanism) -> str:
    """Print a Mechanism as .mech text: title and caption, the species, each step, the product.

    Raises UnprintableMechanism when a string holds a double quote or a line break (the
    language has no escape for them) or a species name is not a name.
    """
    blocks: list[list[str]] = []
    header = _optional("title", mechanism.title) + _optional("caption", mechanism.caption)
    if header:
        blocks.append(header)
    if mechanism.species:
        blocks.append([_species_line("species", s) for s in mechanism.species])
    blocks.extend(_step_lines(step) for step in mechanism.steps)
    if mechanism.product is not None:
        blocks.append([_checkpoint("product", mechanism.product)])
    return "\n\n".join("\n".join(block) for block in blocks) + "\n"
