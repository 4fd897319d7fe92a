"""What starting the command line imports (the speed itself is measured by benchmarks/bench_start.py).

The solver library scipy.optimize takes longer to import than the core together, and most commands pull in
the whole core: ``ditchwright --version`` and ``--help`` import no command module, a one-channel ``calc``
on a lining with a constant n imports no scipy, and the core as a whole loads scipy only when a root is
searched for.
"""

import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def _modules_after(code: str) -> set:
    out = subprocess.run([sys.executable, "-c", code + "\nimport sys; print(' '.join(sorted(sys.modules)))"],
                         capture_output=True, text=True, check=True, cwd=ROOT)
    return set(out.stdout.split())


def test_the_core_imports_no_scipy_until_a_root_is_searched_for():
    loaded = _modules_after("import hydraulics, hydraulics.stability, hydraulics.ditch_run, hydraulics.many_reaches")
    assert "hydraulics.stability" in loaded and not any(m.startswith("scipy") for m in loaded)
    # and a bracketed root search still works, loading it then
    after = _modules_after("from hydraulics.roots import brentq; assert abs(brentq(lambda x: x * x - 2, 0, 2) - "
                           "2 ** 0.5) < 1e-12")
    assert "scipy.optimize" in after


def test_version_and_help_import_no_command_module():
    for argv in (["--version"], ["--help"]):
        loaded = _modules_after(f"import contextlib, io, app.main\nwith contextlib.redirect_stdout(io.StringIO()):\n"
                                f"    try:\n        app.main.main({argv!r})\n    except SystemExit:\n        pass")
        assert "app.main" in loaded
        assert not any(m.startswith("app.cli.") for m in loaded), argv
        assert "hydraulics" not in loaded and "numpy" not in loaded, argv


def test_one_channel_calc_loads_its_command_only_and_no_scipy():
    loaded = _modules_after("import contextlib, io, app.main\nwith contextlib.redirect_stdout(io.StringIO()):\n"
                            "    assert app.main.main(['calc', '--shape', 'trapezoid', '--bottom-width', '2', "
                            "'--side-slope', '3', '--slope', '0.01', '--flow', '20', '--n', '0.03']) == 0")
    assert "app.cli.calc" in loaded
    assert not {"app.cli.sheet", "app.cli.run", "app.cli.inventory_command", "app.cli.drawing"} & loaded
    assert not any(m.startswith(("scipy", "jsonschema", "pyarrow", "reportlab", "ezdxf")) for m in loaded)


def test_every_command_still_has_its_options():
    from app.cli import COMMAND_HELP
    from app.main import build_parser

    whole = build_parser()
    for name in COMMAND_HELP:
        one = build_parser(name)
        sub = next(a for a in one._subparsers._group_actions)
        assert sub.choices[name].format_help() == next(
            a for a in whole._subparsers._group_actions).choices[name].format_help()
