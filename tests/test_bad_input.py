"""Every malformed spar file: exit code 2, one line naming file and key, no traceback, nothing written.

Each file under tests/bad_spars/ starts with "# expect: <fragment>", the words
its message must hold.
"""

from pathlib import Path

import pytest

HERE = Path(__file__).resolve().parent
CASES = sorted((HERE / "bad_spars").glob("*.toml"))


def expected_fragment(path: Path) -> str:
    first = path.read_bytes().split(b"\n", 1)[0].decode("utf-8")
    assert first.startswith("# expect: "), path
    return first[len("# expect: "):]


def test_catalogue_is_large():
    assert len(CASES) >= 40


@pytest.mark.parametrize("path", CASES, ids=[p.stem for p in CASES])
@pytest.mark.parametrize("command", ["check", "build"])
def test_bad_spar_file(path, command, run, tmp_path):
    out = tmp_path / "out"
    args = [command, path] + (["-o", out] if command == "build" else [])
    result = run(args)
    assert result.exit_code == 2, result.output
    message = result.stderr.strip()
    assert "\n" not in message, message
    assert "Traceback" not in result.output + result.stderr
    assert str(path) in message
    assert expected_fragment(path) in message
    assert not out.exists() or not any(out.iterdir())
