"""What changed between a saved ranking and today's ranking of the same scenario, row by row.

A practitioner re-opening a shortlist asks: which candidates moved, by how much, and did any verdict change?
Each change carries today's one-line reason, so the why is read beside the what.
"""

__all__ = ["ranking_changes"]


def ranking_changes(saved: list[dict], today: list[dict]) -> list[dict]:
    """The candidates whose rank or verdict differ, in today's order (rows are screen payload rows).

    Each change: ``material``, ``name``, ``rank_before``/``rank_now`` (None when absent on that side),
    ``moved`` (places up, positive, or down, negative), ``verdict_before``/``verdict_now`` and today's ``reason``.

    >>> before = [{"material": "Pt", "name": "Pt", "rank": 1, "verdict": "acceptable", "reason": "a"},
    ...           {"material": "Ir", "name": "Ir", "rank": 2, "verdict": "acceptable", "reason": "b"}]
    >>> now = [{"material": "Ir", "name": "Ir", "rank": 1, "verdict": "acceptable", "reason": "b"},
    ...        {"material": "Pt", "name": "Pt", "rank": 2, "verdict": "partly acceptable", "reason": "c"}]
    >>> [(c["material"], c["moved"], c["verdict_now"]) for c in ranking_changes(before, now)]
    [('Ir', 1, 'acceptable'), ('Pt', -1, 'partly acceptable')]
    """
    was = {row["material"]: row for row in saved}
    changes = []
    for row in today:
        old = was.pop(row["material"], None)
        rank_before = old["rank"] if old else None
        verdict_before = old["verdict"] if old else None
        if old and rank_before == row["rank"] and verdict_before == row["verdict"]:
            continue
        changes.append({"material": row["material"], "name": row["name"], "rank_before": rank_before,
                        "rank_now": row["rank"], "moved": None if old is None else rank_before - row["rank"],
                        "verdict_before": verdict_before, "verdict_now": row["verdict"], "reason": row["reason"]})
    for old in was.values():  # saved candidates today's catalog no longer ranks
        changes.append({"material": old["material"], "name": old["name"], "rank_before": old["rank"], "rank_now": None,
                        "moved": None, "verdict_before": old["verdict"], "verdict_now": None,
                        "reason": "not ranked by today's catalog"})
    return changes
