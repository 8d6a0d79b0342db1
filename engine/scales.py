"""Reference-electrode scales: convert a potential between a lab's reference and the SHE.

A fixed reference X sits at E_X vs SHE, so E(vs SHE) = E(vs X) + E_X. The
reversible hydrogen electrode moves with pH: E(vs SHE) = E(vs RHE) − (RT ln10/F)·pH
(Bard & Faulkner 2001, Electrochemical Methods, 2nd ed., §2.1 and App. C).
"""

from .constants import T_STANDARD, ZERO_CELSIUS, nernst_slope
from .errors import InputError


def _scale(scales: dict, scale_id: str):
    for key, row in scales.items():
        if key.lower() == str(scale_id).lower():
            return row
    raise InputError(f"unknown reference scale {scale_id!r}; known scales: {', '.join(scales)}", field="scale")


def canonical_scale(scales: dict, scale_id: str) -> str:
    """The scale id as written in ``scales.toml`` (ids are case-insensitive on input)."""
    row = _scale(scales, scale_id)
    return next(key for key, value in scales.items() if value is row)


def scale_offset(scales: dict, scale_id: str, temperature_k: float = T_STANDARD) -> float:
    """Potential of the reference ``scale_id`` vs SHE [V] at ``temperature_k`` [K] (0 for the RHE)."""
    row = _scale(scales, scale_id)
    celsius = temperature_k - ZERO_CELSIUS
    if not (row.t_min - 1e-9 <= celsius <= row.t_max + 1e-9):
        raise InputError(
            f"the {row.name} scale is tabulated only from {row.t_min:g} to {row.t_max:g} °C (asked {celsius:g} °C)",
            field="scale",
        )
    return row.potential + row.dE_dT * (temperature_k - T_STANDARD)


def needs_ph(scales: dict, scale_id: str) -> bool:
    """True when converting on this scale needs the pH (the RHE)."""
    return _scale(scales, scale_id).ph_dependent


def to_she(scales: dict, value: float, scale_id: str, ph: float | None = None,
           temperature_k: float = T_STANDARD) -> float:
    """A potential [V vs ``scale_id``] expressed vs SHE [V].

    >>> from electrosieve.engine.catalog import default_catalog
    >>> round(to_she(default_catalog().scales, 0.0, "RHE", ph=14), 4)
    -0.8282
    """
    offset = scale_offset(scales, scale_id, temperature_k)
    if needs_ph(scales, scale_id):
        if ph is None:
            raise InputError(f"converting on the {scale_id} scale needs the pH", field="ph")
        offset -= nernst_slope(temperature_k) * ph
    return value + offset


def from_she(scales: dict, value: float, scale_id: str, ph: float | None = None,
             temperature_k: float = T_STANDARD) -> float:
    """A potential [V vs SHE] expressed vs ``scale_id`` [V]."""
    return value - to_she(scales, 0.0, scale_id, ph, temperature_k)


def convert(scales: dict, value: float, source: str, target: str, ph: float | None = None,
            temperature_k: float = T_STANDARD) -> float:
    """A potential measured vs ``source`` expressed vs ``target`` [V].

    >>> from electrosieve.engine.catalog import default_catalog
    >>> round(convert(default_catalog().scales, 0.0, "SCE", "SHE"), 4)
    0.2412
    """
    return from_she(scales, to_she(scales, value, source, ph, temperature_k), target, ph, temperature_k)
