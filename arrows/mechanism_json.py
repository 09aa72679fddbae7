"""The mechanism as JSON, in a schema of our own (arrows/mechanism.schema.json, JSON Schema
draft 2020-12): the mechanism as written, plus what the replay derived from it (every state, one
atom-mapped reaction SMILES per step, the diagnostics). Reading JSON back gives the Mechanism as
written; derived parts are ignored on reading because the replay derives them again."""
from __future__ import annotations

import bisect
import json
import re
from dataclasses import replace
from functools import lru_cache
from importlib import resources
from pathlib import Path
from typing import Any, Optional

from .diagnostics import Diagnostic, MechanismError, cannot_read
from .build import atom, move
from .model import COMMENT_PLACES, Checkpoint, Comment, Location, Mechanism, Move, Species, Step
from .writer import UnprintableMechanism, to_text

FORMAT, VERSION = "arrows-mechanism", 1
SCHEMA_FILE = "mechanism.schema.json"


@lru_cache(maxsize=1)
def schema() -> dict:
    """The published JSON Schema (shipped inside the package)."""
    return json.loads(resources.files("arrows").joinpath(SCHEMA_FILE).read_text(encoding="utf-8"))


# --- writing ---------------------------------------------------------------------------------
# The mechanism object has the shape of a data-set record of `arrows check --jsonl`
# (arrows/jsonl-input.schema.json): species as name -> SMILES, moves as text in the language,
# absent options left out. An exported mechanism can be checked at scale as it is.

def _checkpoint(checkpoint: Checkpoint):
    return {"smiles": checkpoint.smiles, "whole_state": True} if checkpoint.whole_state else checkpoint.smiles


def _species_map(species: tuple[Species, ...]) -> dict[str, str]:
    names = [s.name for s in species]
    repeated = sorted({n for n in names if names.count(n) > 1})
    if repeated:
        raise ValueError(f"species name {repeated[0]!r} is used twice; JSON keeps one SMILES per name")
    return {s.name: s.smiles for s in species}


def _step(step: Step) -> dict:
    out: dict[str, Any] = {"label": step.label}
    if step.kind != "forward":
        out["kind"] = step.kind
    for key in ("over", "under"):
        if getattr(step, key) is not None:
            out[key] = getattr(step, key)
    if step.uses:
        out["uses"] = _species_map(step.uses)
    out["moves"] = [str(move) for move in step.moves]
    if step.releases:
        out["releases"] = [str(atom) for atom in step.releases]
    if step.expects:
        out["expect"] = [_checkpoint(c) for c in step.expects]
    return out


def mechanism_dict(mechanism: Mechanism) -> dict:
    """The mechanism as written, as plain JSON data."""
    out: dict[str, Any] = {}
    for key in ("title", "caption"):
        if getattr(mechanism, key) is not None:
            out[key] = getattr(mechanism, key)
    out["species"] = _species_map(mechanism.species)
    out["steps"] = [_step(s) for s in mechanism.steps]
    if mechanism.product is not None:
        out["product"] = _checkpoint(mechanism.product)
    if mechanism.comments:
        out["comments"] = [_comment(c) for c in mechanism.comments]
    return out


def _comment(comment: Comment) -> dict[str, Any]:
    out: dict[str, Any] = {"at": comment.at, "place": comment.place, "text": comment.text}
    if comment.break_after is not None:
        out["break_after"] = comment.break_after
    return out


def _arrows(step_trace, numbers: dict[int, int]) -> list[dict]:
    """The step's moves resolved to atoms, named by the map numbers of its reaction SMILES."""
    return [{"electrons": m.electrons, "source": m.source_kind,
             "source_atoms": [numbers[i] for i in m.source_atoms], "sink_atoms": [numbers[i] for i in m.sink_atoms]}
            for m in step_trace.change.moves]


def _released_smiles(mol, released: frozenset[int]) -> list[str]:
    from rdkit import Chem

    from .rdkit_io import canonical
    mapping: list = []
    fragments = Chem.GetMolFrags(mol, asMols=True, sanitizeFrags=False, fragsMolAtomMapping=mapping)
    return sorted(canonical(frag) for frag, atoms in zip(fragments, mapping) if released.issuperset(atoms))


def states_list(trace) -> list[dict]:
    """The starting state and the state after each derived step, with the step's reaction SMILES."""
    from rdkit import Chem

    from .rdkit_io import canonical, formula
    from .reaction_smiles import fresh_map_numbers, step_reaction

    numbers = fresh_map_numbers(trace)
    out = []
    moments = [(None, trace.initial, None)] + [(st.index + 1, st.after, st) for st in trace.steps]
    for after_step, state, step_trace in moments:
        if state is None:
            break
        mol = Chem.Mol(state.mol)
        Chem.SanitizeMol(mol)
        entry = {"after_step": after_step, "smiles": Chem.MolToSmiles(mol), "canonical_smiles": canonical(state.mol),
                 "formula": formula(mol), "charge": Chem.GetFormalCharge(mol),
                 "released": _released_smiles(state.mol, state.released)}
        if step_trace is not None:
            entry["reaction_smiles"] = step_reaction(step_trace, numbers)
            entry["arrows"] = _arrows(step_trace, numbers)
        out.append(entry)
    return out


def document(mechanism: Mechanism, trace=None, diagnostics=None) -> dict:
    """The whole JSON document: the mechanism, and when a trace is given its states and diagnostics."""
    doc: dict[str, Any] = {"$schema": schema()["$id"], "format": FORMAT, "version": VERSION,
                           "source": mechanism.source_name, "mechanism": mechanism_dict(mechanism)}
    if trace is not None or diagnostics is not None:
        # What derived the states and diagnostics: a data set records it, as a canonical SMILES
        # is RDKit's and may differ between its releases.
        from rdkit import __version__ as rdkit_version
        from . import __version__
        doc["made_by"] = {"arrows": __version__, "rdkit": rdkit_version}
    if trace is not None:
        doc["states"] = states_list(trace)
    if diagnostics is not None:
        doc["diagnostics"] = [d.to_dict() for d in diagnostics]
    return doc


def dumps(mechanism: Mechanism, trace=None, diagnostics=None) -> str:
    return json.dumps(document(mechanism, trace, diagnostics), indent=2, ensure_ascii=False) + "\n"


# --- reading ---------------------------------------------------------------------------------

class _Places:
    """Where the values of a JSON document were written (value_positions), as Locations in it: a
    species' or checkpoint's SMILES is placed just inside its opening quote, as the .mech reader
    places it, so that RDKit's position in the SMILES lands on the character (escapes such as
    \\ before it in the string shift it by one each)."""

    def __init__(self, file: str, where: dict[tuple, tuple[int, int]]):
        self.file, self.where = file, where

    def at(self, path: tuple) -> Location:
        line, column = self.where.get(("mechanism",) + path, (1, 1))
        return Location(self.file, line, column)

    def inside_string(self, path: tuple) -> Location:
        loc = self.at(path)
        return Location(loc.file, loc.line, loc.column + 1) if ("mechanism",) + path in self.where else loc


def _read_checkpoint(data, places: _Places, path: tuple) -> Checkpoint:
    if isinstance(data, str):
        return Checkpoint(data, loc=places.at(path), smiles_loc=places.inside_string(path))
    return Checkpoint(data["smiles"], data.get("whole_state", False), loc=places.at(path),
                      smiles_loc=places.inside_string(path + ("smiles",)))


def _read_species(data: dict, places: _Places, path: tuple) -> tuple[Species, ...]:
    return tuple(Species(name, smiles, loc=places.at(path + (name,)), smiles_loc=places.inside_string(path + (name,)))
                 for name, smiles in data.items())


def _read_move(text: str, where: tuple[int, int], file: str) -> Move:
    """A move's text read with the grammar; a slip is placed inside the JSON string."""
    try:
        return move(text, file)
    except MechanismError as exc:
        line, column = where
        raise MechanismError([replace(d, loc=Location(file, line, column + d.loc.column)) for d in exc.diagnostics]
                             ) from None


# Where a comment may stand against each kind of part _pointed_at names (model.COMMENT_PLACES).
_PLACES_OF = {"mechanism": ("above", "below"), "step": COMMENT_PLACES, "line": ("above", "inline")}


def _read_comments(data: dict, places: _Places) -> tuple[Comment, ...]:
    """The comments of a `mechanism` object; each must point at a part the object has, in a place
    that part has (a comment the writer could not print would be lost)."""
    comments = []
    for k, comment in enumerate(data.get("comments", ())):
        at, place = comment["at"], comment.get("place", "above")
        target = _pointed_at(data, at)
        loc = places.at(("comments", k))
        if target is None:
            raise MechanismError([Diagnostic("AR100", f"comments[{k}].at: {at!r} points at no part of the mechanism",
                                             loc, hint='point at the mechanism (""), "/title", "/species/NAME", '
                                                       '"/steps/N", "/steps/N/moves/M", ... or "/product"')])
        allowed = _PLACES_OF[target]
        if place not in allowed:
            raise MechanismError([Diagnostic("AR100", f"comments[{k}].place: a comment on {at or 'the mechanism'!r} "
                                             f"stands {' or '.join(allowed)}, not {place}", loc,
                                             hint='"below" and "end" belong to a step (or "below" to the '
                                                  'mechanism), "inline" to a line')])
        if "break_after" in comment and place != "inline":
            raise MechanismError([Diagnostic("AR100", f"comments[{k}].break_after: only a comment at the end of a "
                                             f"line (inline) breaks its statement's line, not one {place}", loc,
                                             hint='leave break_after out, or make the comment "inline"')])
        comments.append(Comment(comment["text"], at, place, loc, comment.get("break_after")))
    return tuple(comments)


def _printable(mechanism: Mechanism) -> Mechanism:
    """The mechanism, once its comments are known to print back each in its place (two ending one
    line would run into one; a line break after no token or after the statement's last is no break)."""
    if mechanism.comments:
        try:
            to_text(mechanism)
        except UnprintableMechanism as exc:
            if exc.comment is None:   # not the comments' doing: left to what prints the mechanism
                return mechanism
            k = next(k for k, comment in enumerate(mechanism.comments) if comment is exc.comment)
            raise MechanismError([Diagnostic("AR100", f"comments[{k}]: {exc}", exc.comment.loc,
                                             hint="give each comment that ends a line of one statement its own "
                                                  "break_after, or drop it")]) from None
    return mechanism


def _pointed_at(data: dict, at: str) -> Optional[str]:
    """What the JSON pointer `at` (whose form the schema checks) names in the mechanism object:
    "mechanism" (""), "step", "line" (a part printed on a line of its own) or None when there is no
    such part."""
    if at == "":
        return "mechanism"
    node = data
    parts = at.split("/")[1:]
    for part in parts:
        if isinstance(node, list):
            if not part.isdigit() or int(part) >= len(node):
                return None
            node = node[int(part)]
        elif isinstance(node, dict) and part in node:
            node = node[part]
        else:
            return None
    return "step" if len(parts) == 2 and parts[0] == "steps" else "line"


def mechanism_from_dict(data: dict, source_name: str = "<text>",
                        where: Optional[dict[tuple, tuple[int, int]]] = None) -> Mechanism:
    """The Mechanism of a `mechanism` object that validates against the schema. `where` maps JSON
    paths to (line, column) for messages about move text."""
    where = where or {}
    places = _Places(source_name, where)
    steps = []
    for i, step in enumerate(data["steps"]):
        moves = tuple(_read_move(text, where.get(("mechanism", "steps", i, "moves", j), (1, 1)), source_name)
                      for j, text in enumerate(step["moves"]))
        steps.append(Step(step.get("label", f"step {i + 1}"), step.get("kind", "forward"), step.get("over"),
                          step.get("under"), _read_species(step.get("uses", {}), places, ("steps", i, "uses")), moves,
                          tuple(atom(a) for a in step.get("releases", ())),
                          tuple(_read_checkpoint(c, places, ("steps", i, "expect", k))
                                for k, c in enumerate(step.get("expect", ()))),
                          loc=places.at(("steps", i))))
    product = data.get("product")
    return _printable(Mechanism(data.get("title"), data.get("caption"),
                                _read_species(data["species"], places, ("species",)), tuple(steps),
                                None if product is None else _read_checkpoint(product, places, ("product",)),
                                source_name, comments=_read_comments(data, places)))


_LONGEST_INTEGER = 100   # digits: no field of a mechanism is a number this long (Python refuses 4,300)


def strict_json(text: str):
    """json.loads, refusing NaN and Infinity, which JSON has not (Python's json writes them), a key
    written twice in one object, of which Python would keep the last without a word, an integer
    of more than _LONGEST_INTEGER digits and a string holding half a surrogate pair (no text can
    be written from it)."""
    def refuse(name: str):
        raise json.JSONDecodeError(f"{name} is not a JSON value", text, text.find(name))

    def integer(digits: str) -> int:
        if len(digits.lstrip("-")) > _LONGEST_INTEGER:
            raise json.JSONDecodeError(f"a number of {len(digits.lstrip('-'))} digits is not one this tool reads",
                                       text, text.find(digits))
        return int(digits)

    def whole_text(value: str) -> str:
        if any("\ud800" <= ch <= "\udfff" for ch in value):
            half = next(ch for ch in value if "\ud800" <= ch <= "\udfff")
            escaped = f"\\u{ord(half):04x}"
            found = max(text.find(escaped), text.lower().find(escaped))
            raise json.JSONDecodeError(f"the string holds {escaped}, half of a surrogate pair: not text", text,
                                       max(found, 0))
        return value

    def unique(pairs: list[tuple[str, object]]) -> dict:
        seen = {}
        for key, value in pairs:
            if key in seen:
                raise json.JSONDecodeError(f"the key {key!r} is written twice in one object", text,
                                           text.find(json.dumps(key)))
            seen[whole_text(key)] = whole_text(value) if isinstance(value, str) else value
        return seen
    data = json.loads(text, parse_constant=refuse, parse_int=integer, object_pairs_hook=unique)
    if isinstance(data, list):
        for value in data:
            if isinstance(value, str):
                whole_text(value)
    return whole_text(data) if isinstance(data, str) else data


def json_problem(exc: json.JSONDecodeError, with_line: bool = True) -> str:
    """json's message and the place it names. The message alone reads cut off where the place
    belongs ("Unterminated string starting at")."""
    place = f"line {exc.lineno} column {exc.colno}" if with_line else f"column {exc.colno}"
    return f"{exc.msg} {place}" if exc.msg.endswith(" at") else f"{exc.msg} at {place}"


def json_lines_count(text: str) -> int:
    """How many records `text` holds when it is JSON Lines (two or more lines, each one JSON
    object, as `arrows export` of several FILEs writes); 0 when it is not."""
    lines = [line for line in text.splitlines() if line.strip()]
    if len(lines) < 2:
        return 0
    try:
        return len(lines) if all(isinstance(strict_json(line), dict) for line in lines) else 0
    except (ValueError, RecursionError):   # (JSONDecodeError is a ValueError)
        return 0


_ONE_DOCUMENT = "import takes one JSON document, as `arrows export FILE --to json` writes it"


def loads(text: str, file: str = "<json>") -> Mechanism:
    """Read a JSON document; problems raise MechanismError located at file:line:col."""
    try:
        data = strict_json(text)
    except json.JSONDecodeError as exc:
        records = json_lines_count(text) if exc.msg == "Extra data" else 0
        if records:
            raise MechanismError([Diagnostic(
                "AR100", f"this is JSON Lines, one mechanism per line ({records} lines); {_ONE_DOCUMENT}",
                Location(file, 1, 1),
                hint="split it, one line to a file (each line is a document import reads), or check every "
                     "line with `arrows check --jsonl FILE`")]) from None
        raise MechanismError([Diagnostic("AR100", f"not JSON: {json_problem(exc)}",
                                         Location(file, exc.lineno, exc.colno), hint=_ONE_DOCUMENT)]) from None
    except RecursionError:
        raise MechanismError([Diagnostic("AR100", "not JSON this tool reads: nested too deeply", Location(file, 1, 1),
                                         hint=_ONE_DOCUMENT)]) from None
    from jsonschema import Draft202012Validator
    problems = sorted(Draft202012Validator(schema()).iter_errors(data), key=lambda e: list(e.absolute_path))
    if problems:
        where = value_positions(text)
        raise MechanismError([_schema_diagnostic(p, where, file) for p in problems[:10]])
    return mechanism_from_dict(data["mechanism"], file, value_positions(text))


def load(path: str | Path) -> Mechanism:
    """Read a JSON file written by `arrows export --to json` (or to the same schema)."""
    name = str(path)
    try:
        raw = Path(path).read_bytes()
        text = raw.decode(json.detect_encoding(raw))
    except OSError as exc:
        raise MechanismError([cannot_read(name, exc)]) from None
    except UnicodeDecodeError as exc:
        raise MechanismError([Diagnostic("AR100", f"file is not JSON text ({exc.reason} at byte {exc.start})",
                                         Location(name, 1, 1), hint="JSON files are UTF-8 text")]) from None
    return loads(text, name)


def _schema_diagnostic(error, where: dict, file: str) -> Diagnostic:
    path = tuple(error.absolute_path)
    while path not in where and path:
        path = path[:-1]
    line, column = where.get(path, (1, 1))
    pointer = "".join(f"[{p}]" if isinstance(p, int) else f".{p}" for p in error.absolute_path) or "the document"
    return Diagnostic("AR100", f"{pointer.lstrip('.')}: {error.message}", Location(file, line, column),
                      hint="compare with arrows/mechanism.schema.json, or re-export the mechanism with "
                           "`arrows export FILE --to json`")


# --- where each value starts in the text (for located messages) ------------------------------

_WS = re.compile(r"[ \t\n\r]*")
_SCALAR = re.compile(r"-?(?:0|[1-9][0-9]*)(?:\.[0-9]+)?(?:[eE][-+]?[0-9]+)?|true|false|null")


def value_positions(text: str) -> dict[tuple, tuple[int, int]]:
    """JSON path (keys and indices) -> (line, column) where that value starts, for valid JSON text."""
    positions: dict[tuple, tuple[int, int]] = {}
    line_starts = [0] + [i + 1 for i, ch in enumerate(text) if ch == "\n"]

    def line_col(offset: int) -> tuple[int, int]:
        line = bisect.bisect_right(line_starts, offset)
        return line, offset - line_starts[line - 1] + 1

    def skip(i: int) -> int:
        return _WS.match(text, i).end()

    def value(i: int, path: tuple) -> int:
        i = skip(i)
        positions[path] = line_col(i)
        ch = text[i]
        if ch == "{":
            i = skip(i + 1)
            if text[i] == "}":
                return i + 1
            while True:
                key, i = json.decoder.scanstring(text, skip(i) + 1)
                i = skip(i) + 1            # the colon
                i = skip(value(i, path + (key,)))
                if text[i] == "}":
                    return i + 1
                i += 1                     # the comma
        if ch == "[":
            i = skip(i + 1)
            if text[i] == "]":
                return i + 1
            index = 0
            while True:
                i = skip(value(i, path + (index,)))
                index += 1
                if text[i] == "]":
                    return i + 1
                i += 1
        if ch == '"':
            return json.decoder.scanstring(text, i + 1)[1]
        return _SCALAR.match(text, i).end()

    value(0, ())
    return positions
