# For .ci/run (lead to merge): what the batch tests need beyond ".[test]".
# - headless Chromium (Debian's package) for the HTML index test in tests/test_collect.py;
# - the optional Dask extra for the cluster test in tests/test_jsonl.py (skipped without it).
if ! command -v chromium >/dev/null 2>&1; then
    (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null) \
        || echo "note: chromium could not be installed; the browser test will say so"
fi
pip install -q -e ".[test,cluster]"
