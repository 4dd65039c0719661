"""The bundled scenarios fly end to end and match their committed golden summaries.

Regenerate the golden file after an intended change of the physics or the demo files with
``python3 tests/test_bundled.py --update`` and say why in the commit message.
"""

from __future__ import annotations

import json
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
GOLDEN = Path(__file__).parent / "data" / "golden_summaries.json"
BUNDLED = sorted((ROOT / "scenarios").glob("*.toml"))
BUNDLED = [p for p in BUNDLED if not p.name.startswith("variants")]


def _summary(path: Path) -> dict:
    from sim import api

    out = api.run_scenario(path, write_log=False)
    s = dict(out.result.summary)
    s["legs"] = [leg["name"] for leg in out.result.legs]
    s["events"] = [e["kind"] for e in out.result.events]
    return s


@pytest.mark.parametrize("path", BUNDLED, ids=[p.stem for p in BUNDLED])
def test_bundled_scenario_matches_golden(path):
    from sim import api

    loaded = api.load_scenario(path)
    assert loaded.warnings == [] and loaded.vessel.warnings == []
    golden = json.loads(GOLDEN.read_text())[path.stem]
    got = _summary(path)
    assert set(got) == set(golden)
    for key, want in golden.items():
        if isinstance(want, float):
            # same code and inputs give identical numbers on one machine; 1e-6 allows for
            # other numpy/scipy builds
            assert got[key] == pytest.approx(want, rel=1e-6, abs=1e-9), key
        else:
            assert got[key] == want, key


if __name__ == "__main__" and "--update" in sys.argv:
    sys.path.insert(0, str(ROOT))
    data = {p.stem: _summary(p) for p in BUNDLED}
    GOLDEN.write_text(json.dumps(data, indent=2, sort_keys=True) + "\n")
    print(f"wrote {GOLDEN}")
