"""dropcut: heating and evaporation of multicomponent liquid-fuel droplets, and how the residual liquid drifts.

The Python face of the dropcut library (the same Rust code as the ``dropcut`` command line).

Units: every number you pass and get back is a plain float in SI units (K, Pa, m, s, kg, J, W). Anywhere a
quantity is passed, a string with a unit is accepted as on the command line (``"800K"``, ``"527degC"``,
``"10bar"``, ``"50um"``, ``"30ms"``). Table columns carry their SI unit in the name (``diameter_m``).

Errors: bad input raises :class:`DropcutError` (a ``ValueError``) whose message is the one line the command
line prints after ``error:`` (options named as on the command line, e.g. ``--diameter``); a run that fails on
good input raises :class:`DropcutRunError` (a ``RuntimeError``). Runs release the global interpreter lock, so
several can run at once in threads.
"""

from __future__ import annotations

import json
import os
import sys
import tempfile
import time
from pathlib import Path
from typing import Any, Callable, Dict, List, Mapping, Optional, Sequence, Union

import numpy as np
import pandas as pd

from . import _native
from ._native import DropcutError, DropcutRunError

__all__ = [
    "DropcutError",
    "DropcutRunError",
    "Droplet",
    "Exchange",
    "Fuel",
    "SimulationResult",
    "components",
    "residue",
    "simulate",
    "sweep",
    "table",
    "read_table",
]

__version__: str = _native.__version__

#: A quantity: a plain SI number, or a string with a unit as on the command line ("800K", "10bar", "50um").
Quantity = Union[float, int, str]
PathLike = Union[str, "os.PathLike[str]"]


def _frame(d: Mapping[str, Any]) -> pd.DataFrame:
    """A table dict from the native module as a DataFrame (columns in file order, metadata in ``attrs``)."""
    columns: List[str] = list(d["columns"])
    data = d["data"]
    frame = pd.DataFrame(
        {c: (np.asarray(data[c], dtype=float) if data[c] and isinstance(data[c][0], float) else list(data[c])) for c in columns},
        columns=columns,
    )
    frame.attrs["metadata"] = list(d["metadata"])
    return frame


def read_table(path: PathLike) -> pd.DataFrame:
    """Read a CSV file that dropcut wrote (history.csv, residue.csv, summary.csv, a property table).

    Numbers are parsed exactly (shortest round-trip text → the same float); empty cells are NaN; the ``#``
    metadata lines are in ``frame.attrs["metadata"]``.
    """
    return _frame(_native.read_table(os.fspath(path)))


def components(components: Optional[PathLike] = None) -> pd.DataFrame:
    """The component library as a DataFrame, one row per component (the rows of ``dropcut components --json``).

    Columns: id, name, cas, class, molar_mass_kg_mol, normal_boiling_point_K, critical_temperature_K,
    critical_pressure_Pa, density_15C_kg_m3, cetane_number, cetane_kind, estimated_properties (list of
    property names), sources (list of (property, source id) pairs). ``components``: a folder of extra component
    files (as ``--components``).
    """
    rows = json.loads(_native.components_json(None if components is None else os.fspath(components)))
    return pd.DataFrame(rows)


class Fuel:
    """A liquid fuel: components and their mass fractions (sum 1).

    Make one with :meth:`Fuel.load` (a fuel file, built-in fuel id or component id, as on the command line) or
    :meth:`Fuel.from_composition`.
    """

    __slots__ = ("_native",)

    def __init__(self, native: "_native.Fuel") -> None:
        """Wrap a native fuel (use :meth:`load` or :meth:`from_composition`)."""
        self._native = native

    @classmethod
    def load(cls, path_or_id: PathLike, components: Optional[PathLike] = None) -> "Fuel":
        """A fuel file (``my-fuel.toml``), a built-in fuel (``"demo-wide"``) or a pure component (``"n-decane"``).

        ``components``: a folder of extra component files (as ``--components``).
        """
        return cls(_native.Fuel.load(os.fspath(path_or_id), None if components is None else os.fspath(components)))

    @classmethod
    def from_composition(
        cls,
        composition: Mapping[str, float],
        basis: str = "mass",
        name: str = "composition",
        components: Optional[PathLike] = None,
    ) -> "Fuel":
        """A fuel from ``{component id or alias: fraction}``.

        ``basis``: ``"mass"``, ``"mole"`` or ``"volume"`` (liquid volume at 15 °C). Fractions are checked as in a
        fuel file's ``[composition]`` (0–1 each; a sum within 1 % of 1 is renormalised with a notice).
        """
        return cls(
            _native.Fuel.from_composition(dict(composition), basis, name, None if components is None else os.fspath(components))
        )

    @property
    def name(self) -> str:
        """Fuel name."""
        return self._native.name

    @property
    def description(self) -> str:
        """One-line description."""
        return self._native.description

    @property
    def origin(self) -> str:
        """Where the fuel came from (file, built-in fuel, component)."""
        return self._native.origin

    @property
    def notices(self) -> List[str]:
        """Notices raised while reading (renormalisation, …)."""
        return list(self._native.notices)

    @property
    def composition_hash(self) -> str:
        """16-hex-digit hash of the composition (as in the metadata of output files)."""
        return self._native.composition_hash

    @property
    def molar_mass(self) -> float:
        """Mean molar mass [kg/mol]."""
        return self._native.molar_mass

    @property
    def density_15c(self) -> float:
        """Liquid density at 15 °C [kg/m³]."""
        return self._native.density_15c

    @property
    def composition(self) -> pd.DataFrame:
        """Components with mass, mole and liquid-volume (15 °C) fractions, indexed by component id."""
        return pd.DataFrame(
            {
                "mass_fraction": self._native.mass_fractions,
                "mole_fraction": self._native.mole_fractions,
                "volume_fraction": self._native.volume_fractions,
            },
            index=pd.Index(self._native.component_ids, name="component"),
        )

    def properties(self, temperature: Quantity, pressure: Quantity = 101325.0, activity: str = "ideal") -> Dict[str, Any]:
        """Mixture liquid properties at ``temperature`` (bubble and dew points at ``pressure``), SI units.

        Keys: temperature_K, vapor_pressure_Pa (bubble pressure), density_kg_m3, latent_heat_J_kg, cp_J_kgK,
        viscosity_Pa_s, kinematic_viscosity_m2_s, conductivity_W_mK, surface_tension_N_m, pressure_Pa,
        bubble_point_K and dew_point_K (None in the critical region), activity. The numbers of
        ``dropcut fuel show --json``. ``activity``: ``"ideal"`` or ``"unifac"``.
        """
        return json.loads(self._native.properties_json(temperature, pressure, activity))

    def __repr__(self) -> str:
        return repr(self._native)


FuelLike = Union[Fuel, str, "os.PathLike[str]"]


def _fuel(fuel: FuelLike) -> "_native.Fuel":
    if isinstance(fuel, Fuel):
        return fuel._native
    if isinstance(fuel, (str, os.PathLike)):
        return _native.Fuel.load(os.fspath(fuel), None)
    raise TypeError(f"fuel: expected a dropcut.Fuel, a fuel id or a file path, found {type(fuel).__name__}")


class SimulationResult:
    """The result of :func:`simulate`: the files ``dropcut simulate`` writes, as Python objects."""

    __slots__ = ("history", "summary", "residue", "profiles", "notes")

    def __init__(self, raw: Mapping[str, Any]) -> None:
        """Build from the native result."""
        #: history.csv as a DataFrame (same columns, same numbers).
        self.history: pd.DataFrame = _frame(raw["history"])
        #: summary.json as a dict.
        self.summary: Dict[str, Any] = json.loads(raw["summary_json"])
        #: residue.csv as a DataFrame: residual-liquid indicators along the history (layer mean, and surface for
        #: a resolved droplet).
        self.residue: pd.DataFrame = _frame(raw["residue"])
        #: profiles.csv (radially resolved models) as a DataFrame, else None.
        self.profiles: Optional[pd.DataFrame] = None if raw["profiles"] is None else _frame(raw["profiles"])
        #: Regime notes (the lines the command line prints as ``note:``).
        self.notes: List[str] = list(raw["notes"])

    def __repr__(self) -> str:
        return f"<dropcut.SimulationResult: {len(self.history)} history rows, lifetime {self.summary.get('lifetime_s')} s>"


def simulate(
    fuel: FuelLike, *, limits: Optional[str] = None, history_times: Union[str, Sequence[Quantity], None] = None, **conditions: Union[Quantity, bool, None]
) -> SimulationResult:
    """Heat and evaporate one droplet of ``fuel``; the same run as ``dropcut simulate``.

    Conditions are the ``simulate`` options with ``_`` for ``-`` (``ambient_temperature``, ``pressure``, ``gas``,
    ``diameter``, ``droplet_temperature``, ``velocity``, ``injected``, ``correlation``, ``drag``, ``rtol``,
    ``max_time``, ``ambient_vapor``, ``liquid_mixing``, ``liquid_heat``, ``nodes``, ``non_equilibrium``,
    ``liquid_diffusivity_factor``, ``liquid_conductivity_factor``, ``radiation``, ``absorption_efficiency``,
    ``fibre_diameter``, ``fibre_conductivity``, ``fibre_stems``, ``activity``, ``vapour_diffusion``, ``integrator``), with the command line's defaults
    for those not given (or given as None). Quantities are SI floats or strings with units (``"800K"``).
    ``limits``: ``"aviation"`` or a limits file, for the in-window columns of ``residue``.
    ``history_times``: history rows at these times instead of at every integrator step, as ``--history-times``:
    a string ``"START:STEP:END"`` or ``"T1,T2,..."`` (``"0:0.5ms:20ms"``), or a sequence of times (SI seconds
    or strings with units); the first row, regime changes and the end-of-life row are kept, and the history's
    metadata line ``rows: ...`` says which times were requested.

    Returns a :class:`SimulationResult` (``.history`` DataFrame with the columns of history.csv, ``.summary``
    dict as summary.json, ``.residue`` DataFrame as residue.csv).
    """
    return SimulationResult(_native.simulate(_fuel(fuel), conditions, limits, history_times))


class Exchange:
    """What one :meth:`Droplet.advance` gave the gas over the step (droplet → gas; negative: gas → droplet), SI.

    ``mass``: vapour per fuel component [kg] (numpy array, in the order of :attr:`Droplet.components`);
    ``energy``: the droplet's loss of liquid enthalpy [J] (each pure liquid at 298.15 K is zero; the vapour carries
    liquid enthalpy plus latent heat at the surface temperature); ``momentum``: the droplet's loss of momentum
    [kg m/s] (drag plus the vapour's momentum); ``time``: time advanced [s] (less than asked when the droplet's
    life ended inside the step); ``finished``: the droplet reached its end of life in this step.
    """

    __slots__ = ("mass", "energy", "momentum", "time", "finished")

    def __init__(self, raw: Mapping[str, Any]) -> None:
        """Build from the native result."""
        self.mass: np.ndarray = np.asarray(raw["mass"], dtype=float)
        self.energy: float = float(raw["energy"])
        self.momentum: np.ndarray = np.asarray(raw["momentum"], dtype=float)
        self.time: float = float(raw["time"])
        self.finished: bool = bool(raw["finished"])

    def __repr__(self) -> str:
        return f"<dropcut.Exchange: {self.mass.sum():.4e} kg vapour, {self.energy:.4e} J over {self.time:.4e} s>"


class Droplet:
    """One droplet a spray code advances by its own time step in a far field that may change every step.

    The same model and code as :func:`simulate` (the library's stepping API): a droplet advanced in equal steps
    in a constant far field follows the one-shot run. ``conditions`` are the :func:`simulate` conditions that
    define the droplet and its liquid model (``diameter``, ``droplet_temperature``, ``liquid_mixing``,
    ``liquid_heat``, ``injected`` to let drag slow the droplet, ``rtol``, …); its first far field is their
    ``ambient_temperature`` and ``pressure``. Radiation and a supporting fibre are refused (a solver's radiation
    model owns that heat). ``velocity`` is the condition (slip speed, or the injection speed with ``injected``);
    ``velocity_vector``: the droplet's velocity as 3 components [m/s] (default: ``velocity`` along x).

    Example::

        d = dropcut.Droplet("demo-narrow", diameter="40um", injected=True, velocity=10)
        while not d.finished:
            ex = d.advance(1e-4, temperature=900.0, pressure=2e5)
    """

    def __init__(self, fuel: FuelLike, *, velocity_vector: Optional[Sequence[float]] = None, **conditions: Union[Quantity, bool, None]) -> None:
        """Make the droplet (see the class documentation)."""
        vector = None if velocity_vector is None else [float(v) for v in velocity_vector]
        self._native = _native.Droplet(_fuel(fuel), conditions, vector)

    def advance(
        self,
        dt: float,
        temperature: float,
        pressure: float,
        vapor_mass_fractions: Optional[Sequence[float]] = None,
        gas_velocity: Optional[Sequence[float]] = None,
    ) -> Exchange:
        """Advance by ``dt`` [s] in the far field (gas temperature [K], pressure [Pa], fuel-vapour mass fractions
        per component, gas velocity [m/s] as 3 components) and return the :class:`Exchange` of the step.
        A bad value (NaN, a negative step, a wrong length) raises :class:`DropcutError` and leaves the droplet
        as it was."""
        return Exchange(
            self._native.advance(
                float(dt),
                float(temperature),
                float(pressure),
                None if vapor_mass_fractions is None else [float(v) for v in vapor_mass_fractions],
                None if gas_velocity is None else [float(v) for v in gas_velocity],
            )
        )

    @property
    def components(self) -> List[str]:
        """Component ids, in the order of every per-component array."""
        return list(self._native.components)

    @property
    def time(self) -> float:
        """Time since the droplet was made [s]."""
        return self._native.time

    @property
    def mass(self) -> float:
        """Liquid mass [kg]."""
        return self._native.mass

    @property
    def masses(self) -> np.ndarray:
        """Liquid mass per component [kg]."""
        return np.asarray(self._native.masses, dtype=float)

    @property
    def diameter(self) -> float:
        """Diameter [m]."""
        return self._native.diameter

    @property
    def surface_temperature(self) -> float:
        """Surface temperature [K]."""
        return self._native.surface_temperature

    @property
    def temperatures(self) -> np.ndarray:
        """Liquid temperature: one value (well-mixed) or one per radial cell, centre first [K]."""
        return np.asarray(self._native.temperatures, dtype=float)

    @property
    def velocity(self) -> np.ndarray:
        """Droplet velocity [m/s]."""
        return np.asarray(self._native.velocity, dtype=float)

    @property
    def enthalpy(self) -> float:
        """Liquid enthalpy the droplet holds [J] (each pure liquid at 298.15 K is zero)."""
        return self._native.enthalpy

    @property
    def finished(self) -> bool:
        """True once the droplet reached its end of life."""
        return self._native.finished

    def __repr__(self) -> str:
        return f"<dropcut.Droplet: t = {self.time:.4e} s, d = {self.diameter:.4e} m, Ts = {self.surface_temperature:.2f} K>"


def residue(
    fuel: FuelLike,
    temperature: Quantity = "350K",
    steps: Optional[Sequence[float]] = None,
    activity: str = "ideal",
    limits: Optional[str] = None,
) -> pd.DataFrame:
    """Fuel-quality indicators of the residue of open-vessel weathering at ``temperature`` (``dropcut residue``).

    ``steps``: evaporated mass fractions (increasing, each in [0, 1)); default 0, 0.1, …, 0.9. Columns as in the
    residue.csv of ``dropcut residue --out`` (DCN, T10/T50/T90, flash point, density, viscosity, …). These
    indicators are model estimates for screening, not certification (see ``frame.attrs["metadata"]``).
    """
    return _frame(_native.residue(_fuel(fuel), temperature, None if steps is None else [float(s) for s in steps], activity, limits))


def table(
    fuel: FuelLike,
    *,
    pressure: Quantity = "1atm",
    step: Quantity = "5K",
    from_temperature: Optional[Quantity] = None,
    to_temperature: Optional[Quantity] = None,
    gas: str = "air",
    vapor_from: Quantity = "250K",
    vapor_to: Quantity = "1500K",
    residue: Sequence[float] = (),
    residue_temperature: Quantity = "350K",
    reference: Optional[Mapping[str, Quantity]] = None,
    surrogate: bool = True,
    activity: str = "ideal",
    out: Optional[PathLike] = None,
) -> Dict[str, pd.DataFrame]:
    """Property tables for spray CFD (``dropcut table --no-date``), as DataFrames keyed by file name without
    ``.csv``: ``"mixture"``, ``"components/<id>"`` for each component, ``"residues/…"`` with ``residue``
    fractions, and with ``surrogate=True`` (the command-line default; it runs the droplet model a few dozen
    times) ``"surrogate"`` and ``"fits"``.

    ``from_temperature``/``to_temperature`` are the ``--from``/``--to`` options; ``reference``: the surrogate's
    reference condition as ``{ambient_temperature, pressure, diameter, velocity, droplet_temperature}`` (others
    at their defaults). ``out``: also keep the CSV files in this folder (default: a temporary one).
    """
    def run(folder: str) -> Dict[str, pd.DataFrame]:
        written = _native.table(
            _fuel(fuel), folder, pressure, step, from_temperature, to_temperature, gas, vapor_from, vapor_to,
            [float(r) for r in residue], residue_temperature, None if reference is None else dict(reference), surrogate, activity,
        )
        frames: Dict[str, pd.DataFrame] = {}
        for path in sorted(written):
            p = Path(path)
            if p.suffix == ".csv":
                frames[p.relative_to(folder).with_suffix("").as_posix()] = read_table(p)
        return frames

    if out is not None:
        return run(os.fspath(out))
    with tempfile.TemporaryDirectory(prefix="dropcut-table-") as tmp:
        return run(tmp)


def _progress_display(enabled: bool) -> Optional[Callable[[int, int], None]]:
    """A progress callback: a tqdm bar when tqdm is importable (tqdm.auto: a widget in notebooks), else a line on
    stderr every 10 s. Never writes to stdout."""
    if not enabled:
        return None
    try:
        from tqdm.auto import tqdm  # type: ignore[import-not-found]
    except ImportError:
        tqdm = None
    if tqdm is not None:
        state: Dict[str, Any] = {}

        def bar(done: int, total: int) -> None:
            if "bar" not in state:
                state["bar"] = tqdm(total=total, initial=done, unit="case", desc="sweep", file=sys.stderr)
            b = state["bar"]
            b.update(done - b.n)
            if done >= total:
                b.close()

        return bar
    last = {"t": 0.0}

    def lines(done: int, total: int) -> None:
        now = time.monotonic()
        if done >= total or now - last["t"] >= 10.0:
            last["t"] = now
            print(f"sweep: {done}/{total} cases", file=sys.stderr, flush=True)

    return lines


def sweep(
    spec_path: PathLike,
    threads: int = 0,
    *,
    out: Optional[PathLike] = None,
    histories: bool = False,
    resume: bool = False,
    progress: Union[bool, Callable[[int, int], None]] = True,
    components: Optional[PathLike] = None,
) -> pd.DataFrame:
    """Run a sweep spec (``dropcut sweep SPEC``) and return summary.csv as a DataFrame.

    ``threads``: worker threads (0: every core; results do not depend on it). ``out``: keep the sweep folder
    (summary.csv, journal, ``cases/`` with ``histories=True``) here; default a temporary folder. ``resume``:
    continue the sweep found in ``out``. ``progress``: True shows a tqdm bar (a widget in notebooks) when tqdm
    is importable, else a line on stderr every 10 s; False shows nothing; a callable gets ``(done, total)``.
    """
    callback = progress if callable(progress) else _progress_display(bool(progress))
    comps = None if components is None else os.fspath(components)

    def run(folder: str) -> pd.DataFrame:
        report = _native.sweep(os.fspath(spec_path), folder, threads, histories, resume, callback, comps)
        frame = read_table(report["summary"])
        frame.attrs["report"] = {k: v for k, v in report.items() if k != "summary"}
        return frame

    if out is not None:
        return run(os.fspath(out))
    with tempfile.TemporaryDirectory(prefix="dropcut-sweep-") as tmp:
        return run(tmp)
