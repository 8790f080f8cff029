"""Wood properties: the built-in table and woods a spar file defines itself."""

from __future__ import annotations

import tomllib
from dataclasses import dataclass
from functools import lru_cache
from importlib import resources

from ..units import MPA_PER_PSI

MOISTURE_FACTOR = 1.12
"""Density at 12 % MC over (specific gravity x 1000 kg/m³): the water the wood holds (TRADE.md)."""


@dataclass(frozen=True)
class Wood:
    """One wood. Stresses in N/mm² (MPa), density in kg/m³ at 12 % moisture content."""

    key: str
    name: str
    moe: float
    mor: float
    density: float
    specific_gravity: float | None = None
    source: str = "defined in the spar file"
    compression_perp: float | None = None
    """Compression perpendicular to grain (fibre stress at the proportional limit), N/mm²: what a spigot or a
    sleeve may press on the wood (:mod:`stavegen.checks.parting`); None when the file's own wood gives none."""
    family = "wood"  # not a field: every Wood is a wood (laminates say "laminate")

    @property
    def strength(self) -> float:
        """The stress (N/mm²) the section's strength check holds it to: its modulus of rupture."""
        return self.mor


@lru_cache(maxsize=1)
def wood_table() -> dict[str, Wood]:
    """The built-in woods, keyed by lowercase hyphenated name, in the data file's order."""
    text = resources.files("stavegen.model").joinpath("data/woods.toml").read_text(encoding="utf-8")
    rows = tomllib.loads(text)
    return {
        key: Wood(
            key=key,
            name=row["name"],
            moe=row["moe_mpsi"] * 1e6 * MPA_PER_PSI,
            mor=row["mor_psi"] * MPA_PER_PSI,
            density=float(row["density_kg_m3"]),
            specific_gravity=row["specific_gravity"],
            source=row["source"],
            compression_perp=row["compression_perp_psi"] * MPA_PER_PSI,
        )
        for key, row in rows.items()
    }


def known_wood_keys() -> list[str]:
    return list(wood_table())
