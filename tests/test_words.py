"""The words are made in one place from the facts the rules return: the README's
findings table and the message templates name the same codes, and the rules build no
words (they import nothing that formats for display)."""

import ast
import re
from pathlib import Path

import stallcheck
from stallcheck.render import words

ROOT = Path(__file__).resolve().parents[1]
PACKAGE = Path(stallcheck.__file__).resolve().parent


def _readme_codes() -> set[str]:
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    table = text.split("## Findings", 1)[1].split("\n## ", 1)[0]
    return set(re.findall(r"^\| `([a-z-]+)` \|", table, flags=re.M))


def test_the_readme_findings_table_and_the_templates_name_the_same_codes():
    assert _readme_codes() == set(words.FINDINGS)


def _imports(path: Path) -> set[str]:
    tree = ast.parse(path.read_text(encoding="utf-8"))
    found = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom) and node.module:
            found.add(node.module)
            found.update(f"{node.module}.{a.name}" for a in node.names)
        elif isinstance(node, ast.Import):
            found.update(a.name for a in node.names)
    return found


def _module(name: str) -> Path:
    found = list(PACKAGE.rglob(f"{name}.py"))
    assert len(found) == 1, name
    return found[0]


def test_rules_import_nothing_that_formats_for_display():
    for name in ("findings", "remedies", "layout", "drainage"):
        imported = _imports(_module(name))
        bad = {m for m in imported if "quantities" in m or "display" in m or ".render" in m or m in ("rich", "typer")}
        assert not bad, (name, bad)


def test_rules_return_no_words():
    # No f-string with words in a rule: the messages are the templates' (a finding's
    # facts are numbers and the names of arrangements, never sentences).
    for name in ("findings", "remedies", "layout"):
        tree = ast.parse(_module(name).read_text(encoding="utf-8"))
        sentences = [n for n in ast.walk(tree) if isinstance(n, ast.JoinedStr)]
        assert not sentences, (name, [ast.unparse(n)[:60] for n in sentences])


def test_every_template_fills_from_its_own_fields():
    # Every field a template names is filled by the finding's facts: fill each part with
    # a value of the right kind for each field and check nothing is left unfilled.
    sample = {"pressure": 2.0e5, "differential": 1.5e3, "temperature": 280.0, "mass_flow": 0.1,
              "length": 0.5, "velocity": 12.0, "diameter": 0.05}
    for code, parts in words.FINDINGS.items():
        for name, template in parts.items():
            facts = {}
            for _, field, spec, _ in words._Fill("si", 101325.0).parse(template):
                if field:
                    facts[field] = sample.get(spec.lstrip("~"), 0.5) if spec else "x"
            text = words.fill(template, facts, "si", 101325.0)
            assert "{" not in text and "}" not in text, (code, name)


def _stallcheck_imports(path: Path) -> set[str]:
    return {m for m in _imports(path) if m.startswith("stallcheck")}


def test_the_folders_keep_the_pipeline_in_one_direction():
    # files -> inputs -> physics -> analysis -> result -> render; commands on top.
    allowed = {
        # physics returns numbers: no input records, no result records
        "physics": ("stallcheck.physics", "stallcheck.errors"),
        # gauge readings convert with the site's atmosphere: the constants, and the
        # standard atmosphere's formula (ISO 2533) for an elevation
        "files": ("stallcheck.files", "stallcheck.errors", "stallcheck.inputs", "stallcheck.physics.constants",
                  "stallcheck.physics.atmosphere"),
    }
    for folder, ok in allowed.items():
        for path in (PACKAGE / folder).glob("*.py"):
            bad = {m for m in _stallcheck_imports(path) if not m.startswith(ok)}
            assert not bad, (path.name, bad)
    for path in (PACKAGE / "render").glob("*.py"):
        # a presenter quotes the constants of practice, never runs the physics
        bad = {m for m in _stallcheck_imports(path)
               if m.startswith("stallcheck.physics") and not m.startswith("stallcheck.physics.constants")}
        assert not bad, (path.name, bad)
    # the analysis decides and measures; no word of it comes from a presenter
    for path in (PACKAGE / "analysis").glob("*.py"):
        bad = {m for m in _stallcheck_imports(path) if m.startswith("stallcheck.render")}
        assert not bad, (path.name, bad)
    # the command line computes nothing itself
    bad = {m for m in _stallcheck_imports(PACKAGE / "cli.py") if m.startswith("stallcheck.physics")}
    assert not bad
