"""The layering rule: a module imports only modules above it in LAYERS; only the package
qseries.backend imports python-flint; nothing imports the CLI."""

import ast
import pathlib

import qseries

ROOT = pathlib.Path(qseries.__file__).parent

LAYERS = ["errors", "backend", "series", "products", "lang", "engine", "analysis",
          "modularity", "report", "catalogue", "discovery", "testing", "cli"]


def _layer(module: str) -> str:
    return module.split(".")[0]


def _imports(path: pathlib.Path) -> list[tuple[str, int]]:
    """(imported qseries module relative to the package, line) for every import."""
    tree = ast.parse(path.read_text())
    rel = path.relative_to(ROOT).with_suffix("")
    pkg_parts = list(rel.parts[:-1])
    out = []
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom):
            if node.level:
                base = pkg_parts[: len(pkg_parts) - (node.level - 1)]
                mod = ".".join(base + ([node.module] if node.module else []))
                if not mod:
                    for alias in node.names:
                        out.append((alias.name, node.lineno))
                    continue
                out.append((mod, node.lineno))
            elif node.module and node.module.startswith("qseries."):
                out.append((node.module[len("qseries."):], node.lineno))
            elif node.module and node.module.split(".")[0] == "flint":
                # from flint import ..., and from flint.types... import ... as well
                out.append(("flint", node.lineno))
        elif isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name.split(".")[0] == "flint":
                    out.append(("flint", node.lineno))
    return out


def test_imports_are_found(monkeypatch):
    # the rule below is only as good as _imports: every form of import is seen
    module = ROOT / "products" / "probe_for_the_layering_test.py"
    text = ("import flint\nfrom flint.types.fmpz import fmpz\nfrom flint import fmpz_poly\n"
            "from ..engine import evaluate\nfrom qseries.cli import main\nfrom . import x\n")
    monkeypatch.setattr(pathlib.Path, "read_text", lambda self, *a, **k: text)
    assert _imports(module) == [("flint", 1), ("flint", 2), ("flint", 3), ("engine", 4),
                                ("cli", 5), ("products", 6)]


def test_layering_rule():
    problems = []
    seen = 0
    for path in ROOT.rglob("*.py"):
        seen += 1
        rel = path.relative_to(ROOT)
        if rel.parts[0] in ("__init__.py", "__main__.py"):
            continue
        own = _layer(".".join(rel.with_suffix("").parts))
        for mod, line in _imports(path):
            if mod == "flint":
                if own != "backend":
                    problems.append(f"{rel}:{line} imports python-flint")
                continue
            other = _layer(mod)
            if other == own:
                continue
            if LAYERS.index(other) > LAYERS.index(own):
                problems.append(f"{rel}:{line} ({own}) imports {mod} ({other}), a lower layer")
    assert seen >= 30 and (ROOT / "backend" / "base.py").exists()     # the walk saw the package
    assert not problems, "\n".join(problems)


def test_every_module_has_a_layer():
    for path in ROOT.rglob("*.py"):
        rel = path.relative_to(ROOT)
        if rel.parts[0] in ("__init__.py", "__main__.py"):
            continue
        assert _layer(".".join(rel.with_suffix("").parts)) in LAYERS, rel


def test_the_backend_package_is_layer_two_and_the_only_flint_importer():
    assert LAYERS[:2] == ["errors", "backend"]
    assert (ROOT / "backend" / "__init__.py").exists() and not (ROOT / "_flint.py").exists()
    importers = {path.relative_to(ROOT).parts[0] for path in ROOT.rglob("*.py")
                 if any(mod == "flint" for mod, _ in _imports(path))}
    assert importers == {"backend"}
