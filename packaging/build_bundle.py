"""Build the one-folder desktop bundle with PyInstaller, then try it once.

Usage (from anywhere; paths are taken from this file's place in the repository)::

    python packaging/build_bundle.py [--dist DIR] [--work DIR] [--no-smoke]

Steps: check that the PNG icons match their SVG sources (``render_icons.py --check``), run
PyInstaller on ``packaging/ditchwright.spec``, then, unless ``--no-smoke``, start the bundled
program with ``--version`` on the offscreen Qt platform and fail if it does not exit cleanly.
Prints the bundle's folder and size. Run it with the Python of the environment that has the
program and its dependencies installed (``pip install . pyinstaller``): PyInstaller collects
what that interpreter can import.
"""

from __future__ import annotations

import argparse
import os
import subprocess
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent
SPEC = HERE / "ditchwright.spec"
NAME = "ditchwright"


def run(cmd: list[str], **kwargs) -> None:
    print("+", " ".join(cmd), flush=True)
    subprocess.run(cmd, check=True, **kwargs)


def folder_size(path: Path) -> int:
    return sum(p.stat().st_size for p in path.rglob("*") if p.is_file() and not p.is_symlink())


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--dist", type=Path, default=ROOT / "dist", help="output folder [%(default)s]")
    parser.add_argument("--work", type=Path, default=ROOT / "build" / "pyinstaller",
                        help="PyInstaller's work folder [%(default)s]")
    parser.add_argument("--no-smoke", action="store_true", help="do not start the built program")
    args = parser.parse_args(argv)

    env = dict(os.environ, QT_QPA_PLATFORM=os.environ.get("QT_QPA_PLATFORM", "offscreen"))
    try:
        run([sys.executable, str(HERE / "render_icons.py"), "--check"], env=env)
        run([sys.executable, "-m", "PyInstaller", "--noconfirm", "--clean",
             "--distpath", str(args.dist), "--workpath", str(args.work), str(SPEC)], cwd=ROOT)
    except subprocess.CalledProcessError as exc:
        print(f"error: step failed with exit status {exc.returncode}", file=sys.stderr)
        return 1

    bundle = args.dist / NAME
    exe = bundle / (NAME + (".exe" if sys.platform == "win32" else ""))
    if not exe.is_file():
        print(f"error: PyInstaller finished but {exe} is missing", file=sys.stderr)
        return 1

    if not args.no_smoke:
        # Run from outside the source tree so that nothing is picked up from the checkout.
        print("+", exe, "--version", flush=True)
        done = subprocess.run([str(exe), "--version"], cwd=args.dist, env=env,
                              capture_output=True, text=True, timeout=120)
        if done.returncode != 0:
            print(done.stdout + done.stderr, file=sys.stderr)
            print(f"error: the bundled program exited with status {done.returncode}", file=sys.stderr)
            return 1
        print(done.stdout.strip())

    print(f"bundle: {bundle} ({folder_size(bundle) / 1e6:.0f} MB)")
    if sys.platform == "darwin":
        print(f"app:    {args.dist / 'Ditchwright.app'}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
