"""Type stubs of dropcut._native, the Rust extension behind the dropcut package (use the package, not this)."""

from typing import Any, Callable, Dict, List, Mapping, Optional, Sequence, Union

Quantity = Union[float, int, str]
TableDict = Dict[str, Any]  # {"metadata": [str], "columns": [str], "data": {column: [float] | [str]}}

__version__: str

class DropcutError(ValueError):
    """Bad input: the one-line message the command line prints (exit code 2)."""

class DropcutRunError(RuntimeError):
    """A run that failed on good input (the command line's exit code 1)."""

class Fuel:
    """A liquid fuel with the component library it was read with."""

    @staticmethod
    def load(spec: str, components: Optional[str] = None) -> "Fuel":
        """A fuel file, a built-in fuel id or a component id."""
    @staticmethod
    def from_composition(
        composition: Mapping[str, float], basis: str = "mass", name: str = "composition", components: Optional[str] = None
    ) -> "Fuel":
        """A fuel from {component id: fraction} on a basis (mass, mole, volume)."""
    @property
    def name(self) -> str:
        """Fuel name."""
    @property
    def description(self) -> str:
        """One-line description."""
    @property
    def origin(self) -> str:
        """Where the fuel came from."""
    @property
    def component_ids(self) -> List[str]:
        """Component ids."""
    @property
    def mass_fractions(self) -> List[float]:
        """Mass fractions [-]."""
    @property
    def mole_fractions(self) -> List[float]:
        """Mole fractions [-]."""
    @property
    def volume_fractions(self) -> List[float]:
        """Liquid volume fractions at 15 °C [-]."""
    @property
    def molar_mass(self) -> float:
        """Mean molar mass [kg/mol]."""
    @property
    def density_15c(self) -> float:
        """Density at 15 °C [kg/m³]."""
    @property
    def notices(self) -> List[str]:
        """Notices raised while reading."""
    @property
    def composition_hash(self) -> str:
        """Hash of the composition."""
    def properties_json(self, temperature: Quantity, pressure: Quantity, activity: str = "ideal") -> str:
        """Mixture liquid properties as JSON text."""

def components_json(components: Optional[str] = None) -> str:
    """The component library as JSON text."""

def read_table(path: str) -> TableDict:
    """A CSV file written by dropcut as a table dict."""

def simulate(
    fuel: Fuel, conditions: Optional[Mapping[str, Any]] = None, limits: Optional[str] = None, history_times: Union[str, Sequence[Quantity], None] = None
) -> Dict[str, Any]:
    """One droplet run: {history, residue, profiles, summary_json, notes}."""

def residue(
    fuel: Fuel, temperature: Quantity, steps: Optional[List[float]] = None, activity: str = "ideal", limits: Optional[str] = None
) -> TableDict:
    """Open-vessel weathering residues."""

def table(
    fuel: Fuel,
    out: str,
    pressure: Quantity,
    step: Quantity,
    from_temperature: Optional[Quantity],
    to_temperature: Optional[Quantity],
    gas: str,
    vapor_from: Quantity,
    vapor_to: Quantity,
    residue: List[float],
    residue_temperature: Quantity,
    reference: Optional[Mapping[str, Quantity]],
    surrogate: bool,
    activity: str,
) -> List[str]:
    """Property tables written as CSV into `out`; returns the files written."""

def sweep(
    spec: str,
    out: str,
    threads: int = 0,
    histories: bool = False,
    resume: bool = False,
    progress: Optional[Callable[[int, int], None]] = None,
    components: Optional[str] = None,
) -> Dict[str, Any]:
    """Run a sweep spec into `out`."""


class Droplet:
    def __init__(self, fuel: Fuel, conditions: Optional[Mapping[str, Any]] = None, velocity_vector: Optional[List[float]] = None) -> None: ...
    def advance(self, dt: float, temperature: float, pressure: float, vapor_mass_fractions: Optional[List[float]] = None, gas_velocity: Optional[List[float]] = None) -> Dict[str, Any]: ...
    @property
    def components(self) -> List[str]: ...
    @property
    def time(self) -> float: ...
    @property
    def mass(self) -> float: ...
    @property
    def masses(self) -> List[float]: ...
    @property
    def diameter(self) -> float: ...
    @property
    def surface_temperature(self) -> float: ...
    @property
    def temperatures(self) -> List[float]: ...
    @property
    def velocity(self) -> List[float]: ...
    @property
    def enthalpy(self) -> float: ...
    @property
    def finished(self) -> bool: ...
