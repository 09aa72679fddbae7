"""The wheel must carry every subpackage and the grammar: pyproject lists packages explicitly
(the grammar folder is mapped into arrows.grammar), so a new subpackage must be listed too."""
from pathlib import Path
import tomllib

ROOT = Path(__file__).resolve().parent.parent


def test_every_subpackage_is_listed_in_pyproject():
    config = tomllib.loads((ROOT / "pyproject.toml").read_text())
    listed = set(config["tool"]["setuptools"]["packages"])
    found = {".".join(p.parent.relative_to(ROOT).parts) for p in (ROOT / "arrows").rglob("__init__.py")}
    missing = found - listed
    assert not missing, f"add to [tool.setuptools] packages in pyproject.toml: {sorted(missing)}"


def test_grammar_is_mapped_into_the_package():
    config = tomllib.loads((ROOT / "pyproject.toml").read_text())
    assert config["tool"]["setuptools"]["package-dir"]["arrows.grammar"] == "grammar"
    assert (ROOT / "grammar" / "mechanism.lark").is_file()
