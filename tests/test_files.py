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


def _links(tmp_path, source):
    """The input itself, another spelling of its path, a symbolic link and a hard link
    to it: four names of the one file."""
    unit = tmp_path / "unit.toml"
    unit.write_bytes(source.read_bytes())
    (tmp_path / "sub").mkdir()
    soft = tmp_path / "soft.toml"
    soft.symlink_to(unit)
    hard = tmp_path / "hard.toml"
    os.link(unit, hard)
    return unit, [unit, tmp_path / "sub" / ".." / "unit.toml", soft, hard]


@pytest.mark.parametrize("force", [False, True])
@pytest.mark.parametrize("command", ["chart --csv", "report -o", "report --svg", "survey --csv"])
def test_no_output_replaces_an_input_by_any_of_its_names(tmp_path, command, force):
    # POSIX: a symbolic or hard link names the same file (the same device and inode).
    unit, names = _links(tmp_path, SAMPLES[0])
    before = unit.read_bytes()
    for name in names:
        name_cmd, option = command.split()
        args = [name_cmd, str(unit), option, str(name)]
        if option == "--svg":
            args += ["-o", str(tmp_path / "r.md")]
        result = runner.invoke(app, args + (["--force"] if force else []))
        assert result.exit_code == 2, (command, name, result.output)
        assert "this command reads" in result.output or "exists" in result.output, result.output
        if force:
            assert "this command reads" in result.output, result.output
        assert unit.read_bytes() == before
        assert not (tmp_path / "r.md").exists()


def test_two_writers_of_one_new_report_leave_one_whole_report_and_one_refusal(tmp_path):
    # Two processes started together on one new output: whichever comes second finds
    # the name taken (at its first check or at the exclusive create) and says so.
    import subprocess
    import sys

    report = tmp_path / "handover.md"
    runs = [subprocess.Popen([sys.executable, "-m", "stallcheck", "report", str(SAMPLES[i]), "-o", str(report)],
                             stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True) for i in (0, 1)]
    outcomes = [(p.wait(), p.stderr.read()) for p in runs]
    codes = sorted(code for code, _ in outcomes)
    assert codes[0] in (0, 1) and codes[1] == 2, outcomes
    refused = next(err for code, err in outcomes if code == 2)
    assert "exists" in refused
    text = report.read_text(encoding="utf-8")
    assert text.startswith("# ") and "## Stall point" in text
    assert sorted(p.name for p in tmp_path.iterdir()) == ["handover.md"]


def test_the_exclusive_create_refuses_a_file_that_appeared_after_the_first_check(tmp_path, monkeypatch):
    # The moment between the check and the write, made to happen: another writer's file
    # appears at the name; it is left as it was and the write refused.
    from stallcheck.errors import InputError
    from stallcheck.files import atomic

    target = tmp_path / "out.csv"
    real = os.link

    def racing(src, dst):
        target.write_text("theirs", encoding="utf-8")
        return real(src, dst)

    monkeypatch.setattr(atomic.os, "link", racing)
    with pytest.raises(InputError, match="another process wrote it meanwhile"):
        atomic.write_new(target, "ours", "--csv")
    assert target.read_text(encoding="utf-8") == "theirs"
    assert [p.name for p in tmp_path.iterdir()] == ["out.csv"]
