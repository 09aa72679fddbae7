"""arrows: curved-arrow mechanisms as text, replayed electron by electron, checked, and drawn."""
from . import build
from .api import Diagnostics, check, check_file, check_text
from .diagnostics import Diagnostic, MechanismError
from .language import load, parse
from .model import Mechanism
from .trace import Trace, replay
from .writer import to_text

__version__ = "0.1.0"
__all__ = ["load", "parse", "replay", "check", "check_file", "check_text", "Mechanism", "Trace",
           "Diagnostic", "Diagnostics", "MechanismError", "build", "to_text", "__version__"]
