"""Packaging: the wheel ships the tables; CI runs the README's test command."""

import os
import re
import subprocess
import sys
import venv
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent


def _readme_commands():
    text = (ROOT / "README.md").read_text()
    section = text.split("## Two commands", 1)[1].split("\n## ", 1)[0]
    return re.findall(r"```\n(.+?)\n```", section)


def test_readme_has_exactly_two_commands_and_ci_runs_the_test_one():
    cmds = _readme_commands()
    assert len(cmds) == 2
    assert "feedcheck" in cmds[0] and "pytest" in cmds[1]
    assert cmds[1] in (ROOT / ".ci" / "run").read_text()


@pytest.mark.slow
def test_wheel_ships_tables_and_runs_from_elsewhere(tmp_path):
    """Build the wheel, install it into a fresh venv (reusing this environment's
    dependencies), run `feedcheck tables --verify` from another folder."""
    dist = tmp_path / "dist"
    build = subprocess.run(
        [
            sys.executable,
            "-m",
            "pip",
            "wheel",
            "--no-deps",
            "--no-build-isolation",
            "-w",
            str(dist),
            str(ROOT),
        ],
        capture_output=True,
        text=True,
    )
    if build.returncode != 0 and "hatchling" in build.stderr:
        build = subprocess.run(
            [sys.executable, "-m", "pip", "wheel", "--no-deps", "-w", str(dist), str(ROOT)],
            capture_output=True,
            text=True,
        )
    assert build.returncode == 0, build.stderr[-2000:]
    wheel = next(dist.glob("feedcheck-*.whl"))
    import zipfile

    names = zipfile.ZipFile(wheel).namelist()
    assert "feedcheck/tables/device_ratings.csv" in names
    # the workbench page ships inside the package (no network at run time)
    assert "feedcheck/workbench/static/index.html" in names
    assert "feedcheck/workbench/static/app.js" in names
    env_dir = tmp_path / "venv"
    venv.EnvBuilder(with_pip=True).create(env_dir)
    py = env_dir / "bin" / "python"
    # reuse this environment's installed dependencies (appended after the new venv's own)
    new_site = subprocess.run(
        [str(py), "-c", "import sysconfig; print(sysconfig.get_paths()['purelib'])"],
        capture_output=True,
        text=True,
    ).stdout.strip()
    import sysconfig

    Path(new_site, "deps.pth").write_text(sysconfig.get_paths()["purelib"] + "\n")
    inst = subprocess.run(
        [str(py), "-m", "pip", "install", "--no-deps", "--force-reinstall", str(wheel)],
        capture_output=True,
        text=True,
    )
    assert inst.returncode == 0, inst.stderr[-2000:]
    elsewhere = tmp_path / "elsewhere"
    elsewhere.mkdir()
    env = {k: v for k, v in os.environ.items() if k != "PYTHONPATH"}
    run = subprocess.run(
        [str(env_dir / "bin" / "feedcheck"), "tables", "--verify"],
        capture_output=True,
        text=True,
        cwd=elsewhere,
        env=env,
    )
    assert run.returncode == 0, run.stderr
    assert "device_ratings" in run.stdout and "shipped" in run.stdout
    where = subprocess.run(
        [str(py), "-c", "import feedcheck.tables as t; print(t.shipped_tables_dir())"],
        capture_output=True,
        text=True,
        cwd=elsewhere,
        env=env,
    )
    assert str(env_dir) in where.stdout
