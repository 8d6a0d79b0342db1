"""Unknown is never best: sort keys and wording for missing values and absurd dissolved levels."""

import math

import pytest

from electrosieve.engine.ordering import dissolved_words, order_key, unknown_reason


@pytest.mark.parametrize("prefer", ["low", "high", "zero"])
def test_unknown_sorts_after_every_known_value(prefer):
    values = [None, 5.0, -1e300, float("nan"), 0.0, 1e300, -3.0]
    ordered = sorted(values, key=lambda v: order_key(v, prefer))
    known = [v for v in ordered if v is not None and not math.isnan(v)]
    assert len(known) == 5
    assert all(v is None or math.isnan(v) for v in ordered[5:])


def test_each_preference_orders_known_values():
    assert sorted([0.3, 1.0, -0.2], key=lambda v: order_key(v, "low")) == [-0.2, 0.3, 1.0]
    assert sorted([0.3, 1.0, -0.2], key=lambda v: order_key(v, "high")) == [1.0, 0.3, -0.2]
    assert sorted([0.3, 1.0, -0.2], key=lambda v: order_key(v, "zero")) == [-0.2, 0.3, 1.0]


def test_a_bad_preference_is_refused():
    with pytest.raises(ValueError, match="prefer"):
        order_key(1.0, "best")


def test_unknown_reason_says_unknown_and_why():
    text = unknown_reason("hydrogen onset", "no hydrogen-evolution data for Os in acid solution")
    assert text.startswith("hydrogen onset unknown (no hydrogen-evolution data for Os in acid solution)")


@pytest.mark.parametrize("log10", [0.0, 3.2, 108.0, math.inf])
def test_levels_at_or_above_one_molar_read_dissolves_freely(log10):
    assert dissolved_words(log10) == "dissolves freely (> 1 M)"


def test_levels_below_one_molar_keep_their_figure():
    assert dissolved_words(-6.0) == "up to 10^-6.0 M dissolved"
    assert dissolved_words(-0.04) == "up to 0.91 M dissolved"


def test_no_dissolved_species_is_unknown_not_zero():
    assert "unknown (no dissolved species of Ta in the data)" in dissolved_words(None, "Ta")
