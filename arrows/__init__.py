"""arrows: curved-arrow mechanisms as text, replayed electron by electron, checked, and drawn.

The names below are loaded on first use (PEP 562), so `arrows check` pays only for what it runs.
"""
from importlib import import_module

__version__ = "0.1.0"

_EXPORTS = {
    "load": "language", "parse": "language",
    "check": "api", "check_file": "api", "check_text": "api", "Diagnostics": "api",
    "Diagnostic": "diagnostics", "MechanismError": "diagnostics",
    "Mechanism": "model", "Trace": "trace", "replay": "trace", "to_text": "writer",
}
__all__ = sorted(_EXPORTS) + ["build", "__version__"]


def __getattr__(name: str):
    if name == "build":
        return import_module(".build", __name__)
    if name in _EXPORTS:
        value = getattr(import_module(f".{_EXPORTS[name]}", __name__), name)
        globals()[name] = value
        return value
    raise AttributeError(f"module 'arrows' has no attribute {name!r}")


def __dir__():
    return __all__
