"""The numerical core imports nothing from the HTTP layer (DEVELOPERS.md, "Rules")."""

import ast
from pathlib import Path

import pytest

CORE = Path(__file__).resolve().parents[2] / "service" / "core"
FORBIDDEN = ("flask", "flask_smorest", "marshmallow", "webargs", "werkzeug", "service.api")


@pytest.mark.parametrize(
    "module", sorted(CORE.rglob("*.py")), ids=lambda p: str(p.relative_to(CORE))
)
def test_core_module_imports_no_http_layer(module):
    tree = ast.parse(module.read_text())
    imported = [
        alias.name
        for node in ast.walk(tree)
        if isinstance(node, ast.Import)
        for alias in node.names
    ]
    imported += [node.module or "" for node in ast.walk(tree) if isinstance(node, ast.ImportFrom)]
    bad = [
        name
        for name in imported
        if name.split(".")[0] in FORBIDDEN or name.startswith("service.api")
    ]
    assert not bad, f"{module.name} imports {bad}"
