"""Tests of the Python package against the command-line binary on the same cases.

The binary's files are parsed here with the standard library (csv + float(), which reads the shortest
round-trip text back to the same double), independently of dropcut.read_table, and every number must be equal.
"""

from __future__ import annotations

import csv
import json
import math
import os
import subprocess
import threading
import time
from pathlib import Path

import pandas as pd
import pytest

import dropcut

ROOT = Path(__file__).resolve().parents[2]


def binary() -> Path:
    """The command-line binary: $DROPCUT_BIN, else target/release/dropcut under $CARGO_TARGET_DIR or the repo."""
    if os.environ.get("DROPCUT_BIN"):
        return Path(os.environ["DROPCUT_BIN"])
    target = Path(os.environ.get("CARGO_TARGET_DIR", ROOT / "target"))
    return target / "release" / "dropcut"


def cli(*args: str, expect: int = 0) -> subprocess.CompletedProcess:
    """Run the binary; check its exit code."""
    p = subprocess.run([str(binary()), *args], capture_output=True, text=True, cwd=ROOT)
    assert p.returncode == expect, f"{args}: exit {p.returncode}\n{p.stderr}"
    return p


def cli_error(*args: str) -> str:
    """The one-line message of a command that fails on bad input (exit 2), without `error: `."""
    line = cli(*args, expect=2).stderr.strip().splitlines()[-1]
    assert line.startswith("error: ")
    return line[len("error: "):]


def parse_csv(path: Path):
    """(metadata lines, header, rows of cells) of a CSV file dropcut wrote."""
    lines = path.read_text().splitlines()
    meta = [l[2:] for l in lines if l.startswith("# ")]
    body = [l for l in lines if not l.startswith("#")]
    rows = list(csv.reader(body))
    return meta, rows[0], rows[1:]


def assert_frame_equals_file(frame: pd.DataFrame, path: Path) -> None:
    """Same columns in the same order, same metadata, and every cell equal (numbers exactly, empty = NaN)."""
    meta, header, rows = parse_csv(path)
    assert list(frame.columns) == header
    assert frame.attrs["metadata"] == meta
    assert len(frame) == len(rows), path
    for j, column in enumerate(header):
        values = frame[column].tolist()
        for i, row in enumerate(rows):
            cell, got = row[j], values[i]
            if isinstance(got, float):
                if cell == "":
                    assert math.isnan(got), (path, column, i)
                else:
                    assert got == float(cell), (path, column, i, got, cell)
            else:
                assert got == cell, (path, column, i, got, cell)


CASE = {"ambient_temperature": "900K", "pressure": "10bar", "diameter": "30um", "velocity": 5.0, "droplet_temperature": 300.0}
CASE_CLI = ["--ambient-temperature", "900K", "--pressure", "10bar", "--diameter", "30um", "--velocity", "5", "--droplet-temperature", "300"]


def test_simulate_equals_the_binary(tmp_path: Path) -> None:
    cli("simulate", "demo-wide", *CASE_CLI, "--no-plots", "--out", str(tmp_path))
    r = dropcut.simulate(dropcut.Fuel.load("demo-wide"), **CASE)
    assert_frame_equals_file(r.history, tmp_path / "history.csv")
    assert_frame_equals_file(r.residue, tmp_path / "residue.csv")
    assert r.summary == json.loads((tmp_path / "summary.json").read_text())
    assert r.profiles is None
    assert r.history["d2_ratio"].iloc[0] == pytest.approx(1.0)
    assert r.summary["lifetime_s"] > 0


def test_history_times_equal_the_binary(tmp_path: Path) -> None:
    cli("simulate", "demo-wide", *CASE_CLI, "--no-plots", "--out", str(tmp_path), "--history-times", "0:0.5ms:20ms")
    fuel = dropcut.Fuel.load("demo-wide")
    r = dropcut.simulate(fuel, history_times="0:0.5ms:20ms", **CASE)
    assert_frame_equals_file(r.history, tmp_path / "history.csv")
    assert any(m.startswith("rows: at requested times") for m in r.history.attrs["metadata"])
    # a sequence of SI seconds or strings with units: the same rows as the comma list
    cli("simulate", "demo-wide", *CASE_CLI, "--no-plots", "--out", str(tmp_path / "list"), "--history-times", "0.5ms,1ms,1.5ms")
    listed = dropcut.simulate(fuel, history_times=[5e-4, "1ms", "1.5ms"], **CASE)
    assert_frame_equals_file(listed.history, tmp_path / "list" / "history.csv")
    assert listed.history["time_s"].tolist()[:4] == [0.0, 5e-4, 1e-3, 1.5e-3]
    # without it: a row at every integrator step, and the metadata says so
    plain = dropcut.simulate(fuel, history_times=None, **CASE)
    assert any(m.startswith("rows: one per accepted integrator step") for m in plain.history.attrs["metadata"])
    for bad, message in [("0:0ms:1ms", "^--history-times '0:0ms:1ms': the step"), ([2e-3, 1e-3], "^--history-times = .*strictly ascending"), ([], "^--history-times: the list is empty"), (["1ms", "2mm"], "^--history-times: ")]:
        with pytest.raises(dropcut.DropcutError, match=message):
            dropcut.simulate(fuel, history_times=bad, **CASE)
    with pytest.raises(TypeError):
        dropcut.simulate(fuel, history_times=5, **CASE)
    expected = cli_error("simulate", "demo-wide", "--history-times", "2ms,1ms", "--no-plots", "--out", "/nonexistent/never")
    with pytest.raises(dropcut.DropcutError) as e:
        dropcut.simulate(fuel, history_times="2ms,1ms")
    assert str(e.value) == expected


def test_integrator_keyword_equals_the_binary(tmp_path: Path) -> None:
    cli("simulate", "demo-narrow", "--integrator", "dp853", "--rtol", "1e-8", "--no-plots", "--out", str(tmp_path))
    r = dropcut.simulate("demo-narrow", integrator="dp853", rtol=1e-8)
    assert r.summary == json.loads((tmp_path / "summary.json").read_text())
    assert r.summary["input"]["integrator"] == "dp853"
    assert dropcut.simulate("demo-narrow", rtol=1e-8).summary["input"]["integrator"] == "auto: dp54"
    with pytest.raises(dropcut.DropcutError, match="integrator"):
        dropcut.simulate("demo-narrow", integrator="rk4")


def test_si_floats_and_unit_strings_give_the_same_run() -> None:
    fuel = dropcut.Fuel.load("demo-narrow")
    a = dropcut.simulate(fuel, ambient_temperature=900.0, pressure=1e6, diameter=30e-6, max_time=1)
    b = dropcut.simulate(fuel, ambient_temperature="900K", pressure="10bar", diameter="30um", max_time="1s")
    pd.testing.assert_frame_equal(a.history, b.history)
    assert a.summary == b.summary


def test_numpy_numbers_are_accepted() -> None:
    import numpy as np

    a = dropcut.simulate("demo-narrow", diameter=np.float64(30e-6), nodes=np.int64(12), liquid_mixing="diffusion", max_time=1)
    b = dropcut.simulate("demo-narrow", diameter=30e-6, nodes=12, liquid_mixing="diffusion", max_time=1)
    assert a.summary == b.summary


def test_resolved_droplet_has_profiles_and_a_surface_layer(tmp_path: Path) -> None:
    cli("simulate", "demo-wide", "--liquid-mixing", "diffusion", "--nodes", "10", "--no-plots", "--out", str(tmp_path))
    r = dropcut.simulate("demo-wide", liquid_mixing="diffusion", nodes=10)
    assert_frame_equals_file(r.history, tmp_path / "history.csv")
    assert_frame_equals_file(r.profiles, tmp_path / "profiles.csv")
    assert_frame_equals_file(r.residue, tmp_path / "residue.csv")
    assert set(r.residue["layer"]) == {"mean", "surface"}


def test_composition_fuel_equals_the_same_fuel_file(tmp_path: Path) -> None:
    path = tmp_path / "two.toml"
    path.write_text('name = "two"\nbasis = "mole"\n[composition]\nn-decane = 0.3\nn-hexadecane = 0.7\n')
    from_file = dropcut.Fuel.load(path)
    built = dropcut.Fuel.from_composition({"n-decane": 0.3, "n-hexadecane": 0.7}, basis="mole", name="two")
    assert built.composition_hash == from_file.composition_hash
    assert built.composition["mole_fraction"].tolist() == pytest.approx([0.3, 0.7], rel=1e-12)
    out = tmp_path / "run"
    cli("simulate", str(path), "--no-plots", "--out", str(out))
    assert_frame_equals_file(dropcut.simulate(built).history, out / "history.csv")


def test_properties_equal_fuel_show() -> None:
    shown = json.loads(cli("fuel", "show", "demo-wide", "--temperature", "350K", "--pressure", "2bar", "--json").stdout)
    props = dropcut.Fuel.load("demo-wide").properties("350K", 2e5)
    for key, value in shown["liquid_at_T"].items():
        assert props[key] == value, key
    assert props["bubble_point_K"] == shown["bubble_point_K"]
    assert props["dew_point_K"] == shown["dew_point_K"]
    assert props["pressure_Pa"] == 2e5


def test_components_equal_the_binary() -> None:
    rows = json.loads(cli("components", "--json").stdout)
    frame = dropcut.components()
    assert frame["id"].tolist() == [r["id"] for r in rows]
    assert frame["normal_boiling_point_K"].tolist() == [r["normal_boiling_point_K"] for r in rows]
    assert list(frame.columns) == list(rows[0].keys())


def test_residue_equals_the_binary(tmp_path: Path) -> None:
    out = tmp_path / "residue.csv"
    cli("residue", "demo-wide", "--temperature", "400K", "--steps", "0,0.3,0.6", "--limits", "aviation", "--out", str(out))
    frame = dropcut.residue("demo-wide", temperature=400.0, steps=[0, 0.3, 0.6], limits="aviation")
    assert_frame_equals_file(frame, out)
    assert frame["dcn"].notna().all()


def test_table_columns_and_numbers_equal_the_binary(tmp_path: Path) -> None:
    cli("table", "demo-narrow", "--no-surrogate", "--no-date", "--residue", "0.5", "--out", str(tmp_path))
    frames = dropcut.table("demo-narrow", surrogate=False, residue=[0.5])
    written = sorted(p.relative_to(tmp_path).with_suffix("").as_posix() for p in tmp_path.rglob("*.csv"))
    assert sorted(frames) == written
    assert "mixture" in frames and any(k.startswith("components/") for k in frames)
    for name, frame in frames.items():
        assert_frame_equals_file(frame, tmp_path / f"{name}.csv")
    assert frames["mixture"].columns[0] == "temperature_K"


SPEC = """name = "tiny"
fuels = ["demo-narrow", "demo-wide"]
[conditions]
diameter = ["20um", "40um"]
ambient-temperature = "900K"
"""


def test_sweep_equals_the_binary_whatever_the_threads(tmp_path: Path) -> None:
    spec = tmp_path / "tiny.toml"
    spec.write_text(SPEC)
    cli("sweep", str(spec), "--out", str(tmp_path / "cli"))
    seen = []
    one = dropcut.sweep(spec, threads=1, progress=lambda done, total: seen.append((done, total)))
    two = dropcut.sweep(spec, threads=2, out=tmp_path / "py", progress=False)
    assert_frame_equals_file(one, tmp_path / "cli" / "summary.csv")
    pd.testing.assert_frame_equal(one, two)
    assert (tmp_path / "py" / "summary.csv").read_bytes() == (tmp_path / "cli" / "summary.csv").read_bytes()
    assert len(one) == 4 and (one["status"] == "evaporated").all()
    assert seen and seen[-1] == (4, 4)


def test_sweep_progress_never_writes_to_stdout(tmp_path: Path, capfd: pytest.CaptureFixture) -> None:
    spec = tmp_path / "tiny.toml"
    spec.write_text(SPEC)
    dropcut.sweep(spec, progress=True)
    captured = capfd.readouterr()
    assert captured.out == ""


def test_bad_unit_is_the_command_line_message() -> None:
    expected = cli_error("simulate", "demo-wide", "--diameter", "50uu", "--no-plots", "--out", "/nonexistent/never")
    with pytest.raises(dropcut.DropcutError) as e:
        dropcut.simulate("demo-wide", diameter="50uu")
    assert str(e.value) == expected
    assert isinstance(e.value, ValueError)


def test_unknown_component_is_the_command_line_message() -> None:
    expected = cli_error("fuel", "show", "nodecane")
    with pytest.raises(dropcut.DropcutError) as e:
        dropcut.Fuel.load("nodecane")
    assert str(e.value) == expected
    with pytest.raises(dropcut.DropcutError, match="n-decanne"):
        dropcut.Fuel.from_composition({"n-decanne": 0.5, "n-dodecane": 0.5})


@pytest.mark.parametrize("diameter", [-50e-6, "-50um", 0.0])
def test_negative_or_zero_diameter_is_refused(diameter) -> None:
    with pytest.raises(dropcut.DropcutError, match=r"^--diameter = .*must be positive"):
        dropcut.simulate("demo-wide", diameter=diameter)


def test_other_bad_inputs() -> None:
    with pytest.raises(dropcut.DropcutError, match="unknown condition 'diamter'.*did you mean 'diameter'"):
        dropcut.simulate("demo-wide", diamter=1e-5)
    with pytest.raises(dropcut.DropcutError, match="^--nodes: "):
        dropcut.simulate("demo-wide", nodes=1000)
    with pytest.raises(dropcut.DropcutError, match="^--correlation: "):
        dropcut.simulate("demo-wide", correlation="nonsense")
    with pytest.raises(dropcut.DropcutError, match="basis"):
        dropcut.Fuel.from_composition({"n-decane": 1.0}, basis="weight")
    with pytest.raises(dropcut.DropcutError, match="fraction 60 is above 1"):
        dropcut.Fuel.from_composition({"n-decane": 60, "n-dodecane": 40})
    with pytest.raises(dropcut.DropcutError, match="^--temperature"):
        dropcut.Fuel.load("n-decane").properties("5000K")
    with pytest.raises(dropcut.DropcutError, match="^--pressure: cannot read"):
        dropcut.Fuel.load("n-decane").properties(300.0, "10 furlongs")
    with pytest.raises(dropcut.DropcutError, match="^--steps"):
        dropcut.residue("demo-wide", steps=[0.5, 0.2])
    with pytest.raises(TypeError):
        dropcut.simulate("demo-wide", diameter=[1e-5, 2e-5])
    with pytest.raises(dropcut.DropcutError, match="must not exceed"):
        dropcut.simulate("demo-wide", absorption_efficiency=2.0)
    with pytest.raises(dropcut.DropcutError, match="^--diameter = "):
        dropcut.simulate("demo-wide", diameter="20mm")  # positive, refused by the model's range check
    with pytest.raises(dropcut.DropcutError):
        dropcut.sweep(ROOT / "no-such-spec.toml")


def test_the_lock_is_released_during_a_run() -> None:
    """A Python thread keeps running while (slow, resolved) droplet runs are in Rust: runs repeat until they
    have taken at least 0.3 s in all, so a faster machine or faster code still gives enough ticks to count."""
    ticks = []
    stop = threading.Event()

    def count() -> None:
        while not stop.is_set():
            ticks.append(time.monotonic())
            time.sleep(0.005)

    t = threading.Thread(target=count)
    t.start()
    runs = []
    while sum(end - start for start, end in runs) < 0.3 and len(runs) < 100:
        start = time.monotonic()
        dropcut.simulate("demo-wide", liquid_mixing="diffusion", liquid_heat="conduction", nodes=30)
        runs.append((start, time.monotonic()))
    stop.set()
    t.join()
    total = sum(end - start for start, end in runs)
    inside = [x for x in ticks if any(start + 0.1 * (end - start) < x < end - 0.1 * (end - start) for start, end in runs)]
    assert total >= 0.3, ("runs too short to tell", len(runs), total)
    # the counting thread sleeps 5 ms per tick: with the lock held it would get none inside a run
    assert len(inside) >= 10, (len(runs), total, len(inside))


def test_a_failing_progress_callback_never_stops_a_sweep_and_ctrl_c_is_raised(tmp_path: Path) -> None:
    spec = tmp_path / "tiny.toml"
    spec.write_text(SPEC)

    def broken(done: int, total: int) -> None:
        raise ValueError("display broke")

    assert len(dropcut.sweep(spec, progress=broken)) == 4

    def interrupted(done: int, total: int) -> None:
        raise KeyboardInterrupt

    with pytest.raises(KeyboardInterrupt):
        dropcut.sweep(spec, out=tmp_path / "stopped", progress=interrupted)
    # the sweep ran to its end: resuming finds it complete
    again = dropcut.sweep(spec, out=tmp_path / "stopped", resume=True, progress=False)
    assert again.attrs["report"]["already_complete"]


def test_droplet_steps_follow_the_one_shot_run_and_exchange_what_it_loses():
    """Droplet.advance in equal steps in a constant far field: the life ends where simulate's does (the
    stepping API drives the same integration), and the vapour given to the gas is the mass the droplet lost."""
    conditions = dict(ambient_temperature=800.0, pressure=101325.0, diameter="30um", velocity=5.0)
    one_shot = dropcut.simulate("demo-narrow", **conditions)
    life = one_shot.summary["lifetime_s"]
    d = dropcut.Droplet("demo-narrow", **conditions)
    m0 = d.mass
    assert d.components == [c[len("Yliq_"):] for c in one_shot.history.columns if c.startswith("Yliq_")]
    vapour = 0.0
    energy = 0.0
    elapsed = 0.0
    for _ in range(100000):
        ex = d.advance(1e-4, temperature=800.0, pressure=101325.0)
        vapour += float(ex.mass.sum())
        energy += ex.energy
        elapsed += ex.time
        if ex.finished:
            break
    assert d.finished
    assert abs(elapsed / life - 1.0) < 1e-6, (elapsed, life)
    assert abs(d.time / life - 1.0) < 1e-6
    assert abs(vapour - (m0 - d.mass)) <= 1e-9 * m0
    assert energy > 0.0 and d.enthalpy < 0.0 or d.mass < 0.01 * m0
    # the final state is what the one-shot history ends with
    last = one_shot.history.iloc[-1]
    assert abs(d.surface_temperature / last["surface_temperature_K"] - 1.0) < 1e-6


def test_droplet_reacts_to_a_hotter_far_field():
    """A step change of the gas temperature mid-life shortens the rest of the life, continuously."""
    def life(jump: bool) -> float:
        d = dropcut.Droplet("n-decane", diameter="20um", ambient_temperature="600K")
        t = 0.0
        while not d.finished:
            gas = 1000.0 if (jump and t > 2e-3) else 600.0
            t += d.advance(1e-4, temperature=gas, pressure=101325.0).time
        return t

    assert life(True) < 0.9 * life(False)


def test_droplet_bad_input_raises_and_leaves_the_droplet_as_it_was():
    d = dropcut.Droplet("n-decane", diameter="20um")
    before = (d.time, d.mass)
    for kwargs, needle in [
        (dict(dt=-1e-4, temperature=800.0, pressure=1e5), "positive"),
        (dict(dt=1e-4, temperature=float("nan"), pressure=1e5), "far-field temperature"),
        (dict(dt=1e-4, temperature=800.0, pressure=1e5, vapor_mass_fractions=[0.1, 0.2]), "far-field vapour"),
        (dict(dt=1e-4, temperature=800.0, pressure=1e5, gas_velocity=[1.0, 2.0]), "gas_velocity"),
    ]:
        with pytest.raises(dropcut.DropcutError, match=needle):
            d.advance(**kwargs)
        assert (d.time, d.mass) == before
    with pytest.raises(dropcut.DropcutError, match="radiation"):
        dropcut.Droplet("n-decane", radiation="1500K")
    with pytest.raises(dropcut.DropcutError, match="diameter"):
        dropcut.Droplet("n-decane", diameter="-5um")
