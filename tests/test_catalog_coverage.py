"""Catalog-wide checks: every element has a published cross-check, and every data file's content is pinned."""

import importlib
import tomllib

import pytest

from electrosieve.engine.catalog import builtin_data_dir, default_catalog
from tests.utils.checksums import SPECIES_CHECKSUMS

GROUP_MODULES = ("tests.test_species_core", "tests.test_species_noble", "tests.test_species_transition",
                 "tests.test_species_post_transition")

WITHOUT_CROSS_CHECK = {
    "Hf": "no standard potential, solubility or hydrolysis constant recalled independently of the value that "
          "produced the Hf4+ row (see tests/test_species_transition.py)",
}
"""Elements still lacking an independently tabulated check; the suite fails if this list must grow."""


def _checked_elements() -> set[str]:
    checked = set()
    for name in GROUP_MODULES:
        module = importlib.import_module(name)
        checked |= {check.element for check in module.CHECKS}
        checked |= {row[0] for row in getattr(module, "LABELLED_CHECKS", [])}
    return checked


def test_every_element_has_a_published_cross_check_or_is_listed():
    missing = set(default_catalog().systems) - _checked_elements()
    assert missing <= set(WITHOUT_CROSS_CHECK), f"elements without a cross-check: {sorted(missing - set(WITHOUT_CROSS_CHECK))}"


def test_the_list_of_unchecked_elements_is_not_stale():
    assert not set(WITHOUT_CROSS_CHECK) & _checked_elements()


def _checksum(path) -> tuple[int, float]:
    with path.open("rb") as handle:
        rows = tomllib.load(handle)["species"]
    return len(rows), round(sum(row["dgf"] for row in rows), 3)


SPECIES_FILES = sorted((builtin_data_dir() / "species").glob("*.toml"))


@pytest.mark.parametrize("path", SPECIES_FILES, ids=lambda p: p.name)
def test_species_file_checksums(path):
    """Row count and sum of dgf per file, pinned in tests/utils/checksums.py: every data edit is deliberate."""
    assert path.name in SPECIES_CHECKSUMS, f"{path.name}: add its checksum to tests/utils/checksums.py"
    assert _checksum(path) == SPECIES_CHECKSUMS[path.name]


def test_no_checksum_for_a_missing_file():
    assert set(SPECIES_CHECKSUMS) == {path.name for path in SPECIES_FILES}
