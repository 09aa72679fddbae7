"""The user's own cache folder: $XDG_CACHE_HOME/arrows, else ~/.cache/arrows (the XDG base
directory convention). What arrows keeps between runs goes there, out of the folders a user works
in and ships (a document's folder, a project's)."""
from __future__ import annotations

import os
from pathlib import Path


def user_cache_folder() -> Path:
    """The folder (not made here). Raises RuntimeError when there is no home folder to be found."""
    return Path(os.environ.get("XDG_CACHE_HOME") or Path.home() / ".cache") / "arrows"
