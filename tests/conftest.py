"""Test-wide settings: the runs keep their caches out of the user's own cache folder."""
import atexit
import os
import shutil
import tempfile

# collect's default cache and the parser cache live in $XDG_CACHE_HOME/arrows (arrows.user_cache);
# a test run (and the commands it starts as subprocesses, which inherit this) writes to a folder of
# its own, so it neither reads a user's stale entries nor leaves entries behind.
_CACHE_HOME = tempfile.mkdtemp(prefix="arrows-test-cache-")
os.environ["XDG_CACHE_HOME"] = _CACHE_HOME
atexit.register(shutil.rmtree, _CACHE_HOME, ignore_errors=True)
