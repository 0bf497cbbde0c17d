"""Files written for other people: the permissions a new file of the user's would have
(0666 less the umask: common practice on POSIX systems), written atomically."""

import os
import stat

import pytest
from conftest import SAMPLES
from typer.testing import CliRunner

from stallcheck.cli import app

runner = CliRunner()


@pytest.mark.parametrize("umask, mode", [(0o022, 0o644), (0o077, 0o600), (0o002, 0o664)])
def test_written_files_follow_the_umask(tmp_path, umask, mode):
    old = os.umask(umask)
    try:
        report = tmp_path / "handover.md"
        table = tmp_path / "survey.csv"
        assert runner.invoke(app, ["report", str(SAMPLES[0]), "-o", str(report)]).exit_code in (0, 1)
        assert runner.invoke(app, ["survey", str(SAMPLES[0]), "--csv", str(table)]).exit_code in (0, 1)
    finally:
        os.umask(old)
    for written in (report, table):
        assert stat.S_IMODE(written.stat().st_mode) == mode, written
    # nothing half-written is left beside them
    assert sorted(p.name for p in tmp_path.iterdir()) == ["handover.md", "survey.csv"]
