"""A build writes every output or none: temporary names, renamed only when all are complete."""

import os


import stavegen.build as build_module
from stavegen.build import write_outputs
from stavegen.model.loader import load_spar
from stavegen.pipeline import design

from conftest import SAMPLES


def test_failed_renderer_leaves_previous_outputs_untouched(run, tmp_path, monkeypatch):
    out = tmp_path / "out"
    assert run(["build", SAMPLES / "daysailer-mast.toml", "-o", out]).exit_code == 0
    before = {p.name: p.read_bytes() for p in out.iterdir()}
    assert len(before) >= 2

    import stavegen.render.csv_cutlist as csv_cutlist

    def broken(_design):
        raise RuntimeError("renderer failed on purpose")

    monkeypatch.setattr(csv_cutlist, "to_csv", broken)
    # Change the spar so that a successful write would change the JSON.
    changed = tmp_path / "changed.toml"
    changed.write_text((SAMPLES / "daysailer-mast.toml").read_text().replace("margin = 0.02", "margin = 0.01"))
    result = run(["build", changed, "-o", out])
    assert result.exit_code == 3 and "renderer failed on purpose" in result.stderr
    after = {p.name: p.read_bytes() for p in out.iterdir()}
    assert after == before  # same files, same bytes, no temporary leftovers


def test_outputs_appear_only_when_complete(tmp_path, monkeypatch):
    """While writing, only hidden temporary files exist; after commit, only the final names."""
    result = design(load_spar(SAMPLES / "yawl-mainmast-metric.toml"), layout=True)
    seen = []
    real_add = build_module.OutputSet.add

    def spy(self, name, writer):
        path = real_add(self, name, writer)
        seen.append(sorted(os.listdir(self.folder)))
        return path

    monkeypatch.setattr(build_module.OutputSet, "add", spy)
    written = write_outputs(result, tmp_path)
    for listing in seen:
        assert all(name.startswith(".") and name.endswith(".part") for name in listing)
    assert sorted(os.listdir(tmp_path)) == sorted(p.name for p in written)
