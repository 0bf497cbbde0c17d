"""The Markdown report and the chart picture."""

import builtins
import struct

import pytest
from conftest import SAMPLES
from typer.testing import CliRunner

from stallcheck import __version__
from stallcheck.cli import app

runner = CliRunner()
SECTIONS = ["# Stall check:", "## The unit", "## Method and assumptions", "## Stall point", "## Verdict",
            "## Stall chart", "```text", "## Valve and drain figures", "## Findings", "## Cautions"]


@pytest.mark.parametrize("sample", SAMPLES, ids=lambda p: p.stem)
def test_report_for_every_sample_has_its_sections(tmp_path, sample):
    out = tmp_path / "report.md"
    result = runner.invoke(app, ["report", str(sample), "-o", str(out)])
    assert result.exit_code in (0, 1), result.output
    text = out.read_text(encoding="utf-8")
    positions = [text.index(s) for s in SECTIONS]
    assert positions == sorted(positions)
    assert f"stallcheck {__version__}" in text
    assert "local codes" in text and "scald" in text
    assert ("## What to do" in text) or ("## Margins" in text)
    assert "STALL CHART" not in text and "load, % of design" in text


def test_pictures_are_valid_svg_and_png_of_sensible_size(tmp_path):
    pytest.importorskip("matplotlib")
    svg, png = tmp_path / "chart.svg", tmp_path / "chart.png"
    result = runner.invoke(app, ["report", str(SAMPLES[0]), "-o", str(tmp_path / "r.md"), "--svg", str(svg),
                                 "--png", str(png)])
    assert result.exit_code in (0, 1), result.output
    text = svg.read_text(encoding="utf-8")
    assert text.lstrip().startswith("<?xml") and "<svg" in text and text.rstrip().endswith("</svg>")
    data = png.read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    width, height = struct.unpack(">II", data[16:24])  # the IHDR chunk
    assert 600 <= width <= 2000 and 400 <= height <= 1500


def test_missing_plot_extra_says_how_to_install(tmp_path, monkeypatch):
    real_import = builtins.__import__

    def no_matplotlib(name, *args, **kwargs):
        if name.startswith("matplotlib"):
            raise ImportError("No module named 'matplotlib'")
        return real_import(name, *args, **kwargs)

    monkeypatch.setattr(builtins, "__import__", no_matplotlib)
    out = tmp_path / "r.md"
    result = runner.invoke(app, ["report", str(SAMPLES[0]), "-o", str(out), "--svg", str(tmp_path / "c.svg")])
    assert result.exit_code == 2
    assert 'pip install "stallcheck[plot]"' in result.stderr
    assert not out.exists()


def test_report_refuses_to_overwrite_and_missing_folders(tmp_path):
    out = tmp_path / "r.md"
    out.write_text("keep\n", encoding="utf-8")
    result = runner.invoke(app, ["report", str(SAMPLES[0]), "-o", str(out)])
    assert result.exit_code == 2 and "--force" in result.stderr
    assert out.read_text(encoding="utf-8") == "keep\n"
    assert runner.invoke(app, ["report", str(SAMPLES[0]), "-o", str(out), "--force"]).exit_code in (0, 1)
    result = runner.invoke(app, ["report", str(SAMPLES[0]), "-o", str(tmp_path / "no" / "r.md")])
    assert result.exit_code == 2 and "does not exist" in result.stderr


def test_report_links_the_chart_pictures_it_wrote(tmp_path):
    pytest.importorskip("matplotlib")
    (tmp_path / "pictures").mkdir()
    out = tmp_path / "report.md"
    result = runner.invoke(app, ["report", str(SAMPLES[0]), "-o", str(out), "--svg",
                                 str(tmp_path / "pictures" / "chart.svg")])
    assert result.exit_code in (0, 1), result.output
    assert "![Stall chart](pictures/chart.svg)" in out.read_text(encoding="utf-8")
