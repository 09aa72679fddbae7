"""Checking a JSONL data set: one mechanism per line in, one JSON result per line out.

The input is read lazily and handed to the workers in small chunks with a bounded number in
flight, so memory does not grow with the line count; results are written in input order.
`check_line` is the whole judgement of one line and runs unchanged in this process, in worker
processes or on a Dask cluster, which is why the three give identical results.
"""
from __future__ import annotations

import itertools
import json
import re
from contextlib import nullcontext
from dataclasses import dataclass
from typing import IO, Any, Callable, Iterable, Iterator, Optional

from ..api import check_text
from ..diagnostics import ERROR, WARNING, Diagnostic
from ..language import STATEMENT_WORDS
from ..language import MAX_FILE_BYTES
from ..mechanism_json import json_problem, strict_json
from ..model import Location
from ..trace import Trace, state_smiles
from .records import RecordProblem, RecordText, record_id, record_text

CHUNK_LINES = 32

# A chunk of work: the input's display name, (line number, raw bytes) pairs, the --pka-gap its
# checks use (None: the default) and whether results list the states (--states): both go with the
# work to every worker, local or remote.
Chunk = tuple[str, list[tuple[int, bytes]], Optional[float], bool]


@dataclass
class Tally:
    records: int = 0
    ok: int = 0
    with_errors: int = 0
    with_warnings: int = 0
    steps: int = 0

    def add(self, counts: tuple[int, int, int]) -> None:
        errors, warnings, steps = counts
        self.records += 1
        self.steps += steps
        self.ok += errors == 0
        self.with_errors += errors > 0
        self.with_warnings += warnings > 0


def check_line(source: str, line_number: int, raw: bytes, with_states: bool = False) -> dict:
    """The result object for one input line (its fields: README, "Data sets: arrows check --jsonl").
    `with_states`: it lists the canonical SMILES of the starting state and of the state after each
    step replayed (`states`), for a data set of intermediates."""
    result, trace = _checked_line(source, line_number, raw)
    if with_states:
        result["states"] = [state_smiles(state) for state in trace.states()] if trace is not None else []
    return result


def _checked_line(source: str, line_number: int, raw: bytes) -> tuple[dict, Optional[Trace]]:
    """The result of one line, and the replay it comes from (None: the line held no record)."""
    try:
        # The line without its line ending (a string cut short then reads as unterminated, at its
        # own column, not as holding a control character); a byte-order mark an editor put before
        # the first line is no part of the record.
        record = strict_json(raw.decode("utf-8-sig").rstrip("\r\n"))
    except RecursionError:
        return _rejected(source, line_number, None, 1, "AR110", "not JSON this tool reads: nested too deeply",
                         "each line holds one mechanism record, a few levels deep", ""), None
    except UnicodeDecodeError as exc:
        return _rejected(source, line_number, None, exc.start + 1, "AR110", "the line is not UTF-8 text",
                         "save the data set as UTF-8", ""), None
    except json.JSONDecodeError as exc:
        words = raw.decode("utf-8").split(None, 1)
        mechanism_text = bool(words) and (words[0] in STATEMENT_WORDS or words[0].startswith("#"))
        hint = ("this is a line of mechanism text: check a .mech file without --jsonl" if mechanism_text
                else "each line holds one complete JSON object")
        return _rejected(source, line_number, None, exc.colno, "AR110",
                         f"not JSON: {json_problem(exc, with_line=False)}", hint, ""), None
    ident = record_id(record) if isinstance(record, dict) else None
    try:
        mechanism = record_text(record)
    except RecordProblem as problem:
        return _rejected(source, line_number, ident, 0, "AR111", problem.message, problem.hint, problem.pointer), None
    trace, diags = check_text(mechanism.text, f"{source}:{line_number}")
    final = trace.final if trace is not None else None
    return _result(ident, line_number, [_placed(d, source, line_number, mechanism) for d in diags],
                   steps=len(trace.mechanism.steps) if trace is not None else 0,
                   # (an empty mechanism derives no state: null, as the results schema says, not "")
                   final_smiles=(state_smiles(final) or None) if final is not None else None), trace


def check_chunk(chunk: Chunk) -> list[tuple[str, tuple[int, int, int], tuple[Any, int]]]:
    """Worker entry point: for each line of the chunk, in order, its serialized result, its
    (errors, warnings, steps) counts for the tally, and its record's id and line."""
    from ..checks.protons import pka_gap

    source, lines, gap, with_states = chunk
    out = []
    with pka_gap(gap) if gap is not None else nullcontext():
        for number, raw in lines:
            result = check_line(source, number, raw, with_states)
            out.append((json.dumps(result, ensure_ascii=False),
                        (result["errors"], result["warnings"], result["steps"]), (result["id"], number)))
    return out


def chunks(source: str, stream: IO[bytes], size: int = CHUNK_LINES,
           gap: Optional[float] = None, with_states: bool = False) -> Iterator[Chunk]:
    """Non-blank lines of a binary stream, numbered from 1, in chunks; read lazily."""
    batch: list[tuple[int, bytes]] = []
    for number, raw in enumerate(stream, start=1):
        if not raw.strip():
            continue
        batch.append((number, raw))
        if len(batch) == size:
            yield source, batch, gap, with_states
            batch = []
    if batch:
        yield source, batch, gap, with_states


def one_document(stream: Iterable[bytes]) -> tuple[int, Iterable[bytes]]:
    """A file that is one JSON document over several lines (`arrows export FILE --to json` writes
    one so, indented) is no data set: each of its lines would be a record that is not JSON. Its
    line count when the stream is one such document (0 when not), and the stream's lines to check.
    Only a first line that opens an object or array and is not JSON by itself is read further,
    up to the size a mechanism file may have; the lines read are given back in order."""
    read: list[bytes] = []
    for raw in stream:
        read.append(raw)
        if raw.strip():
            break
    first = read[-1].strip() if read else b""
    if not first.startswith((b"{", b"[")) or _is_json(first):
        return 0, itertools.chain(read, stream)
    size = sum(map(len, read))
    for raw in stream:
        read.append(raw)
        size += len(raw)
        if size > MAX_FILE_BYTES:
            return 0, itertools.chain(read, stream)
    lines = sum(1 for raw in read if raw.strip())
    return (lines if lines > 1 and _is_json(b"".join(read)) else 0), iter(read)


def _is_json(raw: bytes) -> bool:
    try:
        strict_json(raw.decode("utf-8-sig"))
    except (ValueError, RecursionError):   # (not UTF-8, not JSON)
        return False
    return True


def check_stream(source: str, stream: IO[bytes], write: Callable[[str], Any], pool, gap: Optional[float] = None,
                 live: bool = False, with_states: bool = False) -> Tally:
    """Check every line of `stream` on `pool` (a parallel.WorkerPool or ClusterPool) and write one
    JSON result per line through `write`, in input order. `live`: a line arriving on a pipe is sent
    to work at once, not kept until a chunk is full (the caller flushes each result). `with_states`:
    each result lists its states (check_line)."""
    tally = Tally()
    first_line: dict[tuple[type, Any], int] = {}   # each id's first line (ids only: small beside the records)
    work = chunks(source, stream, size=1 if live else CHUNK_LINES, gap=gap, with_states=with_states)
    for serialized, counts, (ident, line) in _flatten(pool.map(check_chunk, work)):
        if ident is not None:
            key = (type(ident), ident)   # (17 and "17" are two ids)
            if key in first_line:
                serialized, counts = _duplicate_id(serialized, source, first_line[key])
            else:
                first_line[key] = line
        tally.add(counts)
        write(serialized + "\n")
    return tally


def _duplicate_id(serialized: str, source: str, first: int) -> tuple[str, tuple[int, int, int]]:
    """The result of a record whose id an earlier record has, with a warning (AR113) saying so:
    results are joined back to records by id."""
    result = json.loads(serialized)
    ident = result["id"]
    warning = Diagnostic("AR113", f"the id {json.dumps(ident, ensure_ascii=False)} is the id of the record on "
                         f"line {first} too", Location(source, result["line"], 0),
                         hint="give every record an id of its own: results are joined back to records by id").to_dict()
    warning["record_location"] = {"field": "/id"}
    # (recounted, the states kept where the result lists them)
    result = {**result, **_result(ident, result["line"], result["diagnostics"] + [warning], result["steps"],
                                  result["final_smiles"])}
    return json.dumps(result, ensure_ascii=False), (result["errors"], result["warnings"], result["steps"])


def _flatten(groups: Iterable[list]) -> Iterator:
    for group in groups:
        yield from group


def _placed(diag: Diagnostic, source: str, line_number: int, mechanism: RecordText) -> dict:
    """A diagnostic of the record's mechanism, located at the JSONL line; where inside the record
    goes in `record_location`: the field, and for a text record the line and column in the text."""
    entry = diag.to_dict()
    inside: dict[str, Any] = {"field": mechanism.field_of(diag.loc.line) or None}
    if mechanism.pointers is None:
        inside.update(line=diag.loc.line, column=diag.loc.column)
    else:
        # A structured record has no lines of its own: "(line 1)" of the text made from it is
        # told as the field it came from.
        entry["message"] = re.sub(r"\(line (\d+)\)", lambda m: f"(at {mechanism.field_of(int(m.group(1))) or 'the record'})",
                                  entry["message"])
        if entry.get("hint"):   # ("delete the invisible character at line 1, column 11": of that text too)
            entry["hint"] = re.sub(r"at line (\d+), column \d+",
                                   lambda m: f"in {mechanism.field_of(int(m.group(1))) or 'the record'}", entry["hint"])
    entry.update(file=source, line=line_number, column=0, record_location=inside)
    return entry


def _rejected(source: str, line_number: int, ident: Any, column: int, code: str, message: str, hint: str,
              field: str) -> dict:
    diag = Diagnostic(code, message, Location(source, line_number, column), hint=hint)
    entry = diag.to_dict()
    entry["record_location"] = {"field": field}
    return _result(ident, line_number, [entry], steps=0, final_smiles=None)


def _result(ident: Any, line_number: int, diagnostics: list[dict], steps: int,
            final_smiles: Optional[str]) -> dict:
    errors = sum(d["severity"] == ERROR for d in diagnostics)
    warnings = sum(d["severity"] == WARNING for d in diagnostics)
    return {"id": ident, "line": line_number, "ok": errors == 0, "errors": errors, "warnings": warnings,
            "steps": steps, "final_smiles": final_smiles, "diagnostics": diagnostics}
