"""`arrows closures SMILES-or-FILE`: every intramolecular closure an enolate (base) or enol (acid)
chemistry could start in one species, with its Baldwin class, ranked; optionally drawn, or the
best one written out as a .mech skeleton."""
from __future__ import annotations

import json
import re
import sys
from dataclasses import dataclass, field
from pathlib import Path
from typing import Optional

import click
from rdkit import Chem

from ._args import LocatedPath
from ..diagnostics import cannot_read
from ..electrons import atom_label
from ..judgement.closures import Closure, candidate_closures, with_atom_maps
from ..judgement.skeleton import product_fragment, skeleton
from ..rdkit_io import read_smiles, reading_hint, unreadable
from .output import emit, refuse, refuse_unsafe_outputs

DRAWING_SUFFIXES = (".svg", ".png")
# Names that no SMILES can be: an argument ending so is a file, even when it is missing.
FILE_SUFFIXES = (".mech", ".mol", ".sdf", ".smi", ".smiles", ".txt")


@dataclass
class _Species:
    mol: Chem.Mol        # every heavy atom mapped
    name: str
    where: str           # file:line:column of the SMILES (or <SMILES>:1:1)
    notes: list[str] = field(default_factory=list)


class _BadInput(Exception):
    def __init__(self, where: str, message: str, hint: str):
        super().__init__(message)
        self.where, self.message, self.hint = where, message, hint

    @classmethod
    def of(cls, diagnostic) -> "_BadInput":
        """A diagnostic, worded as `arrows check` words it."""
        return cls(str(diagnostic.loc), f"{diagnostic.code} {diagnostic.message}", diagnostic.hint or "see `arrows check`")


def _from_smiles(smiles: str, where: str, line: int = 1, column: int = 1) -> Chem.Mol:
    mol, reason, position = read_smiles(smiles)
    if mol is None:
        raise _BadInput(f"{where}:{line}:{column + (position or 0)}", f"AR102 {unreadable('the SMILES', reason)}",
                        reading_hint(reason, "check brackets, ring-closure digits and charges"))
    _refuse_repeated_maps(mol, smiles, where, line, column)
    return mol


def _refuse_repeated_maps(mol: Chem.Mol, smiles: str, where: str, line: int = 1, column: int = 1) -> None:
    """AR103, as `arrows check` gives it: a map number names one atom. Located at its second use."""
    seen: set[int] = set()
    for atom in mol.GetAtoms():
        number = atom.GetAtomMapNum()
        if number and number in seen:
            uses = [m.start() for m in re.finditer(rf"\[[^\[\]]*:{number}\]", smiles)]
            raise _BadInput(f"{where}:{line}:{column + (uses[1] if len(uses) > 1 else 0)}",
                            f"AR103 map number {number} is used twice",
                            "give each atom its own map number, or none (unmapped atoms are numbered for you)")
        seen.add(number)


def _names(argument: str) -> Optional[str]:
    """"file" or "folder" where `argument` names one, else None: a SMILES longer than a file name
    may be names neither (Path.is_file raises on it)."""
    try:
        path = Path(argument)
        return "file" if path.is_file() else "folder" if path.is_dir() else None
    except OSError:
        return None


def _load(argument: str, species_name: Optional[str]) -> _Species:
    path = Path(argument)
    named = _names(argument)
    is_file = named == "file"
    if not argument.strip():   # Path("") is the current folder
        raise _BadInput("<SMILES>:1:1", "AR102 RDKit cannot read the SMILES: empty SMILES",
                        "give a SMILES, a .mech, .mol or .smi file")
    if named == "folder":
        raise _BadInput(f"{argument}:1:1", "AR100 a folder, not a species", "give a SMILES, a .mech, .mol or .smi file")
    if not is_file and path.suffix.lower() in FILE_SUFFIXES:
        raise _BadInput.of(cannot_read(argument))
    if species_name is not None and path.suffix.lower() != ".mech":
        where = f"{argument}:1:1" if is_file else "<SMILES>:1:1"
        raise _BadInput(where, f"--species {species_name} chooses among the species of a .mech file; "
                        f"this input holds one", "drop --species, or give the .mech file")
    if not is_file:
        return _Species(with_atom_maps(_from_smiles(argument, "<SMILES>")), "substrate", "<SMILES>:1:1")
    if path.suffix.lower() == ".mech":
        from ..diagnostics import MechanismError
        from ..language import load
        try:
            mechanism = load(path)
        except MechanismError as exc:
            raise _BadInput.of(exc.diagnostics[0])
        chosen = [s for s in mechanism.species if species_name in (None, s.name)]
        if not chosen:
            names = ", ".join(s.name for s in mechanism.species) or "none"
            raise _BadInput(f"{argument}:1:1", f"no species named {species_name!r}", f"the species are: {names}")
        sp = chosen[0]
        mol = _from_smiles(sp.smiles, str(path), sp.smiles_loc.line, sp.smiles_loc.column)
        return _Species(with_atom_maps(mol), sp.name, f"{path}:{sp.smiles_loc.line}:{sp.smiles_loc.column}")
    if path.suffix.lower() in (".mol", ".sdf"):
        mol = Chem.MolFromMolFile(str(path))
        if mol is None:
            raise _BadInput(f"{argument}:1:1", "AR102 RDKit cannot read the molfile", "check the file is a V2000/V3000 molfile")
        _refuse_repeated_maps(mol, "", argument)
        return _Species(with_atom_maps(mol), path.stem.replace("-", "_") or "substrate", f"{argument}:1:1")
    try:
        text = path.read_text(encoding="utf-8")
    except OSError as exc:
        raise _BadInput.of(cannot_read(argument, exc))
    except UnicodeDecodeError as exc:
        raise _BadInput(f"{argument}:1:1", f"AR100 cannot read the file: {exc}", "give a UTF-8 text file")
    lines = [(number, line) for number, line in enumerate(text.splitlines(), 1)
             if line.strip() and not line.lstrip().startswith("#")]
    if not lines:
        raise _BadInput(f"{argument}:1:1", "AR112 the file holds no SMILES", "write one SMILES on the first line")
    number, line = lines[0]
    column = len(line) - len(line.lstrip()) + 1
    sp = _Species(with_atom_maps(_from_smiles(line.split()[0], argument, number, column)), "substrate",
                  f"{argument}:{number}:{column}")
    if len(lines) > 1:
        sp.notes.append(f"{argument}:{lines[1][0]}:1: note: the file holds {len(lines)} SMILES; only the first "
                        f"(line {number}) is studied")
    return sp


def _row(mol: Chem.Mol, rank: int, c: Closure, product: Optional[str]) -> dict:
    label = lambda i: atom_label(mol, i)   # noqa: E731
    return {
        "rank": rank,
        "nucleophile": {"atom": label(c.nucleophile.atom), "kind": c.nucleophile.kind, "via": c.nucleophile.via,
                        "pka_of_the_proton_removed": c.nucleophile_pka},
        "electrophile": {"atom": label(c.electrophile.atom), "kind": c.electrophile.kind},
        "ring_size": c.size,
        "ring": [label(i) for i in c.ring],
        "class": c.closure.name,
        "baldwin": {"verdict": c.verdict.word, "rule": c.verdict.rule},
        "outlook": c.outlook,
        "reason": c.reason,
        "equivalent": [f"{label(a)} onto {label(b)}" for a, b in c.equivalent],
        "product": product,
    }


def _left_out(mol: Chem.Mol, c: Closure) -> dict:
    return {"nucleophile": atom_label(mol, c.nucleophile.atom), "electrophile": atom_label(mol, c.electrophile.atom),
            "ring_size": c.size, "class": c.closure.name, "reason": c.barred}


def _table(rows: list[dict]) -> list[str]:
    headers = ("#", "nucleophile", "electrophile", "ring", "class", "Baldwin", "outlook", "product")
    cells = [(str(r["rank"]), f"{r['nucleophile']['atom']} {r['nucleophile']['kind']}",
              f"{r['electrophile']['atom']} {r['electrophile']['kind']}", str(r["ring_size"]), r["class"],
              r["baldwin"]["verdict"] + (f" ({r['baldwin']['rule']})" if r["baldwin"]["rule"] else ""),
              r["outlook"], r["product"] or "-") for r in rows]
    widths = [max(len(h), *(len(c[k]) for c in cells)) for k, h in enumerate(headers)]
    line = lambda values: "  ".join(v.ljust(w) for v, w in zip(values, widths)).rstrip()   # noqa: E731
    out = [line(headers)]
    for r, c in zip(rows, cells):
        out.append(line(c))
        why = [r["reason"]] + ([f"same by symmetry: {', '.join(r['equivalent'])}"] if r["equivalent"] else [])
        out.extend(" " * (widths[0] + 2) + w for w in why)
    return out


@click.command("closures")
@click.argument("species")
@click.option("--species", "species_name", help="With a .mech file: the species to study (default: the first).")
@click.option("--format", "fmt", type=click.Choice(["text", "json"]), default="text", show_default=True)
@click.option("--max-ring", type=click.IntRange(3, 12), default=7, show_default=True,
              help="Largest ring listed (Baldwin's rules cover 3 to 7).")
@click.option("--condense", is_flag=True,
              help="Follow an aldol closure with its E1cB dehydration (products and --write).")
@click.option("--draw", "draw_path", type=LocatedPath(dir_okay=False),
              help="Draw the candidate products, new bond highlighted, to this .svg or .png file.")
@click.option("--write", "write_path", type=LocatedPath(dir_okay=False),
              help="Write a .mech skeleton for the best candidate (or the one chosen with --pick).")
@click.option("--pick", type=click.IntRange(min=1), default=1, show_default=True,
              help="Which ranked candidate --write drafts.")
def closures_command(species, species_name, fmt, max_ring, condense, draw_path, write_path, pick):
    """List every intramolecular ring closure of SPECIES (a SMILES, or a .mech/.mol/.smi file).

    Nucleophiles: alpha carbons bearing H next to a carbonyl or nitrile (as enolates or enols),
    hydroxyl oxygens, carboxylates, amine nitrogens. Electrophiles: aldehyde, ketone, ester, amide
    and nitrile carbons, enone beta carbons, sp3 carbons bearing a halide or sulfonate, the carbons
    of an epoxide, aziridine or halonium ion (named exo at the near carbon, endo at the far one, by
    the ring's C-C bond). Ranked favoured five- and
    six-membered rings first, aldehydes before ketones before esters before amides (common
    practice), each with its Baldwin class and verdict. Closures that cannot form (bridging a
    benzene ring, a trans C=C or a triple bond in a small ring, a bridgehead alkene) are left
    out, with the reason. Atoms are named by map number; atoms without one are numbered, carbons
    first. Exit status: 0 listed, 2 unreadable input or bad usage.
    """
    inputs = [species] if _names(species) == "file" else []
    refuse_unsafe_outputs({"--draw": draw_path}, inputs)
    refuse_unsafe_outputs({"--write": write_path}, inputs, writes_mechanism=True)
    if write_path and Path(write_path).exists():
        # A draft never replaces a file, as `arrows new` never does: it may be the author's work.
        refuse(f"--write {write_path} already exists; nothing written",
               "choose another name for the draft, or delete the file first")
    if draw_path and Path(draw_path).suffix.lower() not in DRAWING_SUFFIXES:
        refuse(f"--draw {draw_path} does not end in .svg or .png: the drawing is written as one of those",
               f"for example --draw {Path(draw_path).with_suffix('.svg')}")
    try:
        sp = _load(species, species_name)
    except _BadInput as exc:
        _fail(exc.where, exc.message, exc.hint)
    for note in sp.notes:
        click.echo(note, err=True)
    mol = sp.mol
    candidates = candidate_closures(mol, max_ring)
    found = [c for c in candidates if c.barred is None]
    barred = [_left_out(mol, c) for c in candidates if c.barred is not None]
    texts = [skeleton(mol, c, condense, sp.name) for c in found]
    products = [_product_line(t) for t in texts]
    rows = [_row(mol, k, c, p) for k, (c, p) in enumerate(zip(found, products), 1)]
    numbered = Chem.MolToSmiles(mol, canonical=False)
    if fmt == "json":
        click.echo(json.dumps({"species": numbered, "closures": rows, "left_out": barred}, indent=2,
                              ensure_ascii=False))
    else:
        click.echo(f"species  {numbered}")
        click.echo("\n".join(_table(rows)) if rows else "no intramolecular closure found between the sites listed")
        if barred:
            click.echo("left out, as they cannot form:")
            click.echo("\n".join(f"   {b['nucleophile']} onto {b['electrophile']}, {b['class']}: {b['reason']}"
                                  for b in barred))
    if draw_path:
        if _draw(draw_path, mol, found, texts, rows):
            click.echo(f"drew {draw_path}", err=True)
        else:
            click.echo(f"{draw_path}: note: no candidate product to draw; nothing written", err=True)
    if write_path:
        if pick > len(found):
            _fail(sp.where, f"there {'is' if len(found) == 1 else 'are'} {len(found)} candidate(s); "
                  f"--pick {pick} is out of range", "pick a rank from the table")
        emit(texts[pick - 1], write_path)
        click.echo(f"wrote {write_path}: {found[pick - 1].closure.name}", err=True)


def _product_line(text: str) -> Optional[str]:
    for line in reversed(text.splitlines()):
        if line.startswith("product "):
            return line.split('"')[1]
    return None


def _draw(path: str, mol: Chem.Mol, found: list[Closure], texts: list[str], rows: list[dict]) -> bool:
    """A grid of the candidate products with the new bond highlighted (RDKit's 2D drawer); False
    when there is none to draw (nothing written)."""
    from rdkit.Chem import rdDepictor
    from rdkit.Chem.Draw import rdMolDraw2D
    rdDepictor.SetPreferCoordGen(True)
    mols, bonds, legends = [], [], []
    for c, text, row in zip(found, texts, rows):
        maps = (mol.GetAtomWithIdx(c.nucleophile.atom).GetAtomMapNum(),
                mol.GetAtomWithIdx(c.electrophile.atom).GetAtomMapNum())
        product = product_fragment(text, maps[0])
        if product is None:
            continue
        work = Chem.RemoveHs(product, sanitize=False)
        Chem.SanitizeMol(work)
        ends = [a.GetIdx() for a in work.GetAtoms() if a.GetAtomMapNum() in maps]
        bond = work.GetBondBetweenAtoms(*ends) if len(ends) == 2 else None
        for atom in work.GetAtoms():
            atom.SetAtomMapNum(0)
        rdDepictor.Compute2DCoords(work)
        mols.append(work)
        bonds.append([bond.GetIdx()] if bond is not None else [])
        legends.append(f"{row['rank']}. {row['nucleophile']['atom']} onto {row['electrophile']['atom']}: "
                       f"{row['class']}, {row['outlook']}")
    if not mols:
        return False
    columns = min(3, len(mols))
    rows_n = (len(mols) + columns - 1) // columns
    size = (320, 260)
    svg = path.lower().endswith(".svg")
    drawer = (rdMolDraw2D.MolDraw2DSVG if svg else rdMolDraw2D.MolDraw2DCairo)(
        size[0] * columns, size[1] * rows_n, size[0], size[1])
    options = drawer.drawOptions()
    options.legendFontSize = 14
    options.continuousHighlight = False      # the new bond itself in colour, not a band beside it
    options.setHighlightColour((0.0, 0.447, 0.698))   # Okabe-Ito blue #0072B2
    drawer.DrawMolecules(mols, legends=legends, highlightAtoms=[[] for _ in mols], highlightBonds=bonds)
    drawer.FinishDrawing()
    data = drawer.GetDrawingText()
    emit(data, path)
    return True


def _fail(where: str, message: str, hint: str) -> None:
    """`where: error CODE message` for a diagnostic with a code, `where: error: message` for bad usage."""
    separator = " " if re.match(r"AR\d{3} ", message) else ": "
    click.echo(f"{where}: error{separator}{message}\n    hint: {hint}", err=True)
    sys.exit(2)
