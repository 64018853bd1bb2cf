"""Magnet grades, conductors and steels: data rows with sources, read from ``data/materials.yaml``.

Values are SI here (T, A/m, kg/m^3, S/m, degC). Each row keeps the source and the confidence
tag of the data file (V read in the primary text, S several secondary sources agree,
M recalled and to be confirmed), so reports can print where every number came from.

References
----------
ASTM A1101-16 (sintered NdFeB); GB/T 13560-2017 (grade suffixes); IEC 60404-8-1:2015;
IEC 60028 (100 % IACS = 58.0 MS/m); CRC Handbook of Chemistry and Physics; ASM Handbook
Vol. 2; Bozorth, Ferromagnetism (1951). Full titles in the data file.
"""
from __future__ import annotations

import difflib
from dataclasses import dataclass
from functools import lru_cache
from importlib import resources

import yaml

#: No permanent-magnet material has a remanence above about 1.5 T (ASTM A1101 tops out near
#: 1.5 T for sintered NdFeB); values above this are refused as input errors.
MAX_PERMANENT_MAGNET_REMANENCE_T = 1.55


@dataclass(frozen=True)
class Grade:
    """A permanent-magnet grade. Remanence in T, coercivity in A/m, temperature in degC."""

    name: str
    family: str
    remanence_min: float
    remanence_max: float
    coercivity_min: float
    max_working_temperature: float
    density: float
    source: str
    confidence: str

    @property
    def remanence_nominal(self) -> float:
        """Middle of the grade's remanence range [T]."""
        return 0.5 * (self.remanence_min + self.remanence_max)


@dataclass(frozen=True)
class Conductor:
    """A non-magnetic conductor. Conductivity in S/m, density in kg/m^3."""

    name: str
    conductivity: float
    density: float
    source: str
    confidence: str


@dataclass(frozen=True)
class Steel:
    """A soft ferromagnetic steel. Saturation polarization Js in T, density in kg/m^3."""

    name: str
    saturation: float
    density: float
    source: str
    confidence: str


@lru_cache(maxsize=1)
def _data() -> dict:
    text = resources.files("planner").joinpath("data/materials.yaml").read_text(encoding="utf-8")
    return yaml.safe_load(text)


def _source(key: str) -> str:
    return _data()["sources"][key]


def _ndfeb_number(name: str) -> int:
    return int(name[1:])


@lru_cache(maxsize=1)
def grades() -> dict[str, Grade]:
    """All known grades by canonical name (``N42``, ``N42SH``, ``SmCo5``, ``AlNiCo5``...)."""
    data = _data()
    table: dict[str, Grade] = {}
    for base, row in data["ndfeb_grades"].items():
        for suffix, suffix_row in data["ndfeb_suffixes"].items():
            if _ndfeb_number(base) > _ndfeb_number(suffix_row["highest_grade"]):
                continue
            coercivity = suffix_row["coercivity_min_kA_per_m"]
            if suffix == "" and _ndfeb_number(base) >= 52:
                coercivity = data["ndfeb_high_grade_coercivity_min_kA_per_m"]
            confidence = max(row["confidence"], suffix_row["confidence"], key="VSM".index)
            table[base + suffix] = Grade(
                name=base + suffix, family="NdFeB",
                remanence_min=row["remanence_min_T"], remanence_max=row["remanence_max_T"],
                coercivity_min=coercivity * 1e3,
                max_working_temperature=suffix_row["max_working_temperature_C"],
                density=data["ndfeb_density_kg_per_m3"],
                source=f"{_source(row['source'])}; {_source(suffix_row['source'])}",
                confidence=confidence,
            )
    for name, row in data["other_grades"].items():
        table[name] = Grade(
            name=name, family=row["family"],
            remanence_min=row["remanence_min_T"], remanence_max=row["remanence_max_T"],
            coercivity_min=row["coercivity_min_kA_per_m"] * 1e3,
            max_working_temperature=row["max_working_temperature_C"],
            density=row["density_kg_per_m3"], source=_source(row["source"]),
            confidence=row["confidence"],
        )
    return table


def _lookup(table: dict, name: str):
    by_folded = {key.casefold(): value for key, value in table.items()}
    return by_folded.get(str(name).strip().casefold())


def find_grade(name: str) -> Grade | None:
    """The grade called ``name`` (case-insensitive), or None."""
    return _lookup(grades(), name)


def nearest_names(name: str, names, count: int = 3) -> list[str]:
    """Known names closest to ``name``, for 'did you mean' hints."""
    folded = {n.casefold(): n for n in names}
    return [folded[m] for m in difflib.get_close_matches(str(name).casefold(), list(folded), n=count, cutoff=0.5)]


@lru_cache(maxsize=1)
def conductors() -> dict[str, Conductor]:
    """Conductors by name, conductivity in S/m."""
    data = _data()
    return {
        name: Conductor(name, row["conductivity_MS_per_m"] * 1e6, row["density_kg_per_m3"],
                        _source(row["source"]), row["confidence"])
        for name, row in data["conductors"].items()
    }


def find_conductor(name: str) -> Conductor | None:
    """The conductor called ``name`` (case-insensitive; ``aluminum`` accepted), or None."""
    return _lookup(conductors(), str(name).casefold().replace("aluminum", "aluminium"))


@lru_cache(maxsize=1)
def steels() -> dict[str, Steel]:
    """Soft steels by name, saturation polarization in T."""
    data = _data()
    return {
        name: Steel(name, row["saturation_T"], row["density_kg_per_m3"], _source(row["source"]), row["confidence"])
        for name, row in data["steels"].items()
    }


def find_steel(name: str) -> Steel | None:
    """The steel called ``name`` (case-insensitive), or None."""
    return _lookup(steels(), name)


def ndfeb_temperature_coefficient() -> float:
    """Reversible temperature coefficient of NdFeB remanence [1/K] (about -0.12 %/K, trade tables)."""
    return _data()["ndfeb_temperature_coefficient_percent_per_K"] / 100
