"""The README's pasted outputs are what the commands print today: each block, split at
its `[...]` marks, appears in the command's output piece by piece, in order."""

import re

import pytest
from conftest import ROOT
from typer.testing import CliRunner

from stallcheck.cli import app

README = (ROOT / "README.md").read_text(encoding="utf-8")


def _pastes() -> list[tuple[str, str]]:
    """Each ```text block with the command it shows: the last "`stallcheck <args>`" in
    the paragraph before it."""
    out = []
    for m in re.finditer(r"```text\n(.*?)```", README, re.S):
        paragraph = README[:m.start()].rstrip("\n").split("\n\n")[-1]
        commands = re.findall(r"`stallcheck ([^`]+)`", paragraph)
        if commands:
            out.append((commands[-1], m.group(1)))
    return out


PASTES = _pastes()


def test_the_readme_shows_the_outputs_it_claims():
    assert {args.split()[0] for args, _ in PASTES} >= {"check"}


@pytest.mark.parametrize("args, block", PASTES, ids=[a for a, _ in PASTES])
def test_a_pasted_output_is_what_the_command_prints(args, block, monkeypatch):
    monkeypatch.chdir(ROOT)
    out = CliRunner().invoke(app, args.split() + (["--width", "80"] if args.startswith("check") else []),
                             env={"NO_COLOR": "1", "COLUMNS": "80"}).stdout.splitlines()
    at = 0
    for piece in re.split(r"^\[\.\.\.\]\n", block, flags=re.M):
        lines = piece.rstrip("\n").splitlines()
        if not lines:
            continue
        found = next((i for i in range(at, len(out) - len(lines) + 1) if out[i:i + len(lines)] == lines), None)
        assert found is not None, f"not in the output of `stallcheck {args}` in order:\n" + "\n".join(lines)
        at = found + len(lines)


def test_the_readme_stays_short():
    # The README is for the user; internals go to DEVELOPERS.md (under 20 kB).
    assert len(README.encode("utf-8")) < 20_000


def _keys_documented(text: str) -> set[str]:
    """Every name inside a `code span` (`[drain] lift`, `drain.lift`, `lift`)."""
    return {word for span in re.findall(r"`([^`]+)`", text) for word in re.findall(r"[a-z_]+", span)}


def test_every_unit_file_key_is_documented_in_the_readme_and_the_reference():
    from stallcheck.files.unitfile import _KNOWN

    reference = (ROOT / "docs" / "reference.md").read_text(encoding="utf-8")
    unit_readme = README.split("## The unit file", 1)[1].split("\n## ", 1)[0]
    unit_reference = reference.split("## The unit file", 1)[1].split("\n## ", 1)[0]
    keys = {name for section, names in _KNOWN.items() if section for name in names}
    keys -= {"capacity", "pump_capacity", "bins"}  # arrays of tables, written [[drain.capacity]]
    for text in (unit_readme, unit_reference):
        assert keys <= _keys_documented(text) | {"hours", "load", "differential", "flow", "back_pressure",
                                                  "inlet_temperature"}, keys - _keys_documented(text)


def test_every_top_level_field_of_the_contract_is_documented():
    import json

    served = json.loads(CliRunner().invoke(app, ["check", str(ROOT / "sample_units" / "si_water_heater.toml"),
                                                 "--json"]).stdout)
    reference = (ROOT / "docs" / "reference.md").read_text(encoding="utf-8")
    for text in (README, reference):
        contract = text.split("## The result contract", 1)[1].split("\n## ", 1)[0]
        assert set(served) <= _keys_documented(contract), set(served) - _keys_documented(contract)
