"""Reading TOML data files and turning validation errors into one readable line."""

import tomllib
from pathlib import Path
from typing import Annotated

from pydantic import BaseModel, BeforeValidator, ValidationError

from .errors import CatalogError


def _int_to_float(value):
    """TOML writes 0 for 0.0: accept an integer where a real number is expected (but never a bool)."""
    if isinstance(value, int) and not isinstance(value, bool):
        return float(value)
    return value


Number = Annotated[float, BeforeValidator(_int_to_float)]
"""A real number in a data file (integers accepted, booleans and strings refused)."""


def read_toml(path: Path) -> dict:
    """Parse ``path`` as TOML, or raise a :class:`CatalogError` naming the file."""
    try:
        with path.open("rb") as handle:
            return tomllib.load(handle)
    except FileNotFoundError:
        raise CatalogError(f"{path}: file not found") from None
    except tomllib.TOMLDecodeError as error:
        raise CatalogError(f"{path}: not valid TOML ({error})") from None
    except (OSError, UnicodeDecodeError) as error:
        raise CatalogError(f"{path}: cannot be read ({error})") from None


def describe(error: ValidationError, path: Path, entry: str) -> str:
    """One line naming the file, the entry and the field of the first problem in ``error``."""
    problem = error.errors()[0]
    field_name = ".".join(str(part) for part in problem["loc"]) or "(entry)"
    given = problem.get("input")
    shown = "" if isinstance(given, (dict, list)) else f" (given {given!r})"
    return f"{path}: {entry}: field {field_name!r}: {problem['msg']}{shown}"


def validate_rows(path: Path, rows: list, model: type[BaseModel], entry_word: str) -> list:
    """Validate each row of an array of tables, naming the row (number and formula) on error."""
    if not isinstance(rows, list):
        raise CatalogError(f"{path}: expected an array of [[{entry_word}]] tables")
    parsed = []
    for index, row in enumerate(rows):
        name = row.get("label") or row.get("formula") or row.get("id") or "?" if isinstance(row, dict) else "?"
        try:
            parsed.append(model.model_validate(row))
        except ValidationError as error:
            raise CatalogError(describe(error, path, f"{entry_word} #{index + 1} ({name})")) from None
    return parsed


def validate_table(path: Path, document: dict, model: type[BaseModel], entry_word: str) -> dict:
    """Validate a TOML document whose top-level keys are entries (``[key]`` tables)."""
    table = {}
    for key, value in document.items():
        if not isinstance(value, dict):
            raise CatalogError(f"{path}: {entry_word} {key!r}: expected a table of fields, got {value!r}")
        try:
            table[key] = model.model_validate(value)
        except ValidationError as error:
            raise CatalogError(describe(error, path, f"{entry_word} {key!r}")) from None
    return table
