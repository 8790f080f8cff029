"""Composite laminates (sheathing cloth, reinforcing tape): the built-in table and those a spar file defines.

A laminate is a material like a wood (``key``, ``name``, ``moe``, ``strength``, ``density``, ``source``)
with a cured ply's thickness, and for the shop the fibre and resin one ply takes. Stresses N/mm² (MPa),
density kg/m³, lengths mm, areal weights g/m².
"""

from __future__ import annotations

import tomllib
from dataclasses import dataclass
from functools import lru_cache
from importlib import resources

CLOTH, TAPE = "cloth", "tape"


@dataclass(frozen=True)
class Laminate:
    """One laminate, as laid: modulus and strength along the spar, density and thickness of a cured ply."""

    key: str
    name: str
    moe: float
    strength: float
    density: float
    ply_thickness: float | None
    source: str = "defined in the spar file"
    fibre_g_m2: float | None = None
    resin_g_m2: float | None = None
    roll_width: float | None = None
    kind: str = CLOTH
    family = "laminate"  # not a field: the strength check credits no form factor to a laminate

    def resin_per_ply(self) -> float | None:
        """Epoxy one ply takes (kg/m²): the data's coverage figure, or, without one, none stated."""
        return None if self.resin_g_m2 is None else self.resin_g_m2 / 1000


@lru_cache(maxsize=1)
def laminate_table() -> dict[str, Laminate]:
    """The built-in laminates, keyed by their short names, in the data file's order."""
    text = resources.files("stavegen.model").joinpath("data/laminates.toml").read_text(encoding="utf-8")
    rows = tomllib.loads(text)
    return {
        key: Laminate(
            key=key,
            name=row["name"],
            moe=float(row["E_mpa"]),
            strength=float(row["strength_mpa"]),
            density=(row["fibre_g_m2"] + row["resin_g_m2"]) / row["ply_thickness_mm"],
            ply_thickness=float(row["ply_thickness_mm"]),
            source=row["source"],
            fibre_g_m2=float(row["fibre_g_m2"]),
            resin_g_m2=float(row["resin_g_m2"]),
            roll_width=float(row["roll_width_mm"]),
            kind=row["family"],
        )
        for key, row in rows.items()
    }


def known_laminate_keys() -> list[str]:
    return list(laminate_table())
