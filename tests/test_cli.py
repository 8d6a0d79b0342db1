"""The command line: JSON contracts, human output, and clear messages for bad input."""

import itertools
import json
import subprocess
import sys

import pytest

from electrosieve.app.cli import main
from electrosieve.engine.catalog import default_catalog


def run(capsys, *argv):
    code = main(list(argv))
    captured = capsys.readouterr()
    return code, captured.out, captured.err


def run_json(capsys, *argv):
    code, out, err = run(capsys, *argv, "--json")
    assert code == 0, err
    return json.loads(out)


def test_diagram_json_contract(capsys):
    payload = run_json(capsys, "diagram", "Zn")
    assert {"domains", "boundaries", "water"} <= set(payload)
    for domain in payload["domains"]:
        assert {"formula", "phase", "region", "polygon"} <= set(domain)
        assert all(len(point) == 2 for point in domain["polygon"])
    assert all(len(b["species"]) == 2 and b["equation"] for b in payload["boundaries"])


def test_diagram_activity_moves_the_zinc_line(capsys):
    low = run_json(capsys, "diagram", "Zn", "--activity", "1e-6")
    high = run_json(capsys, "diagram", "Zn", "--activity", "1")
    line = lambda p: next(b for b in p["boundaries"] if set(b["species"]) == {"Zn", "Zn^2+"})  # noqa: E731
    # Zn2+/Zn: E = -0.762 + 0.0296 log a (Bard, Parsons & Jordan 1985; Nernst)
    assert line(high)["intercept"] == pytest.approx(-0.762, abs=0.01)
    assert line(low)["intercept"] - line(high)["intercept"] == pytest.approx(-6 * 0.02958, abs=1e-4)


def test_point_json_contract_with_negative_potential(capsys):
    payload = run_json(capsys, "point", "Zn", "--ph", "7", "--potential=-1.5")
    assert payload["formula"] == "Zn" and payload["region"] == "immunity" and payload["phase"] == "solid"


def test_point_on_another_scale(capsys):
    # -1.2 V vs SCE = -0.959 V vs SHE: still just below the Zn/Zn2+ line at 10^-6 (-0.940 V)
    payload = run_json(capsys, "point", "Zn", "--ph", "4", "--potential=-1.2", "--scale", "SCE")
    assert payload["potential_she"] == pytest.approx(-0.9588, abs=1e-4)
    assert payload["region"] == "immunity"


def test_convert_json_contract(capsys):
    payload = run_json(capsys, "convert", "0.5", "--from", "SCE", "--to", "SHE")
    assert payload == {**payload, "value": pytest.approx(0.7412), "scale": "SHE"}


def test_convert_rhe_needs_ph(capsys):
    code, _, err = run(capsys, "convert", "0.5", "--from", "RHE", "--to", "SHE")
    assert code == 2 and "--ph" in err


def test_scales_json_lists_sources(capsys):
    payload = run_json(capsys, "scales")
    ids = {row["id"] for row in payload}
    assert {"SHE", "RHE", "SCE", "AgAgCl-sat", "AgAgCl-3M", "HgHgO-1M", "MSE"} <= ids
    assert all(row["source"] and row["citation"] for row in payload)


def test_human_diagram_output(capsys):
    code, out, _ = run(capsys, "diagram", "Fe")
    assert code == 0 and "Fe2O3" in out and "O2/H2O" in out


@pytest.mark.parametrize("argv, message", [
    (["diagram", "Unobtainium"], "known elements: "),
    (["point", "Zn", "--ph", "30", "--potential", "0"], "ph must be between -2 and 16"),
    (["point", "Zn", "--ph", "7", "--potential", "5"], "potential must be between -3 and 3"),
    (["point", "Zn", "--ph", "seven", "--potential", "0"], "--ph must be a number"),
    (["diagram", "Zn", "--activity", "0"], "activity must be between"),
    (["diagram", "Zn", "--activity", "2"], "activity must be between"),
    (["diagram", "Zn", "--activity", "nan"], "activity must be a finite number"),
    (["point", "Zn", "--ph", "7", "--potential", "0", "--scale", "XYZ"], "unknown reference scale 'XYZ'"),
    (["diagram", "Zn", "--ph-limits", "5:1"], "empty or inverted"),
    (["diagram", "Zn", "--temperature", "-10"], "temperature must be between"),
    (["diagram", "Zn", "--overlay", "/nonexistent/dir"], "not a directory"),
    (["diagram"], "required"),
    (["frobnicate"], "invalid choice"),
])
def test_bad_input_gives_a_clear_message(capsys, argv, message):
    code, out, err = run(capsys, *argv)
    assert code == 2
    assert message in err
    assert "Traceback" not in err + out


def test_malformed_user_data_file(capsys, tmp_path):
    (tmp_path / "Zn.toml").write_text('element = "Zn"\n[[species]]\nformula = "Zn"\ncharge = 0\nphase = "solid"\n'
                                      'dgf = "oops"\nsource = "wagman1982"\n')
    code, _, err = run(capsys, "diagram", "Zn", "--overlay", str(tmp_path))
    assert code == 2
    assert "Zn.toml" in err and "species #1 (Zn)" in err and "'dgf'" in err


@pytest.mark.parametrize("old, new", [
    (["diagram", "Zn", "--window-ph", "0:14", "--window-potential=-1:2"], ["diagram", "Zn", "--ph-limits", "0:14",
                                                                         "--potential-limits=-1:2"]),
    (["screen", "--ph", "1", "--potential", "0.5", "--materials", "Pt,Cu,Zn", "--weights", "unacceptable=1,price=0.2"],
     ["screen", "--ph", "1", "--potential", "0.5", "--materials", "Pt,Cu,Zn", "--weights", "unacceptable:1,price:0.2"]),
])
def test_old_spellings_work_for_one_release_with_a_warning(capsys, old, new):
    code, out, err = run(capsys, *old, "--json")
    assert code == 0 and "deprecated" in err and "next release" in err
    assert json.loads(out) == run_json(capsys, *new)


def test_old_overlay_and_store_spellings_still_reach_the_same_options(capsys, tmp_path):
    from electrosieve.app.cli import build_parser

    parsed = build_parser().parse_args(["serve", "--data-dir", str(tmp_path)])
    assert parsed.store == str(tmp_path)
    parsed = build_parser().parse_args(["scales", "--data", str(tmp_path)])
    assert parsed.overlay == str(tmp_path)
    err = capsys.readouterr().err
    assert "--data-dir is deprecated" in err and "use --store" in err and "use --overlay" in err


def test_console_script_runs_without_traceback():
    result = subprocess.run([sys.executable, "-m", "electrosieve.app.cli", "point", "Nope", "--ph", "1", "--potential", "0"],
                            capture_output=True, text=True, timeout=60)
    assert result.returncode == 2
    assert "unknown element" in result.stderr and "Traceback" not in result.stderr


def test_screen_json_contract(capsys):
    payload = run_json(capsys, "screen", "--ph", "0:1", "--potential=-0.2:0", "--role", "cathode", "--materials", "Pt,Zn")
    assert payload["scenario"]["ph"] == [0.0, 1.0] and payload["scenario"]["materials"] == ["Pt", "Zn"]
    for row in payload["results"]:
        assert {"material", "rank", "fractions", "instability_ev", "log10_dissolved", "margin_mv", "reason", "hazards"} <= set(row)
        assert set(row["fractions"]) == {"immunity", "passivation", "hydride", "corrosion"}
    assert [row["material"] for row in payload["results"]] == ["Pt", "Zn"]
    assert payload["cautions"]


def test_screen_csv(capsys):
    code, out, err = run(capsys, "screen", "--ph", "14", "--potential", "1.5:1.7", "--scale", "RHE", "--family", "noble", "--csv")
    assert code == 0, err
    lines = out.strip().splitlines()
    assert lines[0].startswith("rank,material,")
    assert len(lines) == 1 + len([m for m in __import__("electrosieve.engine.catalog").engine.catalog.default_catalog().materials.values()
                                  if m.family == "noble"])


def test_screen_human_table_shows_rule_and_cautions(capsys):
    code, out, _ = run(capsys, "screen", "--ph", "7", "--potential", "0.2", "--materials", "Pt,Zn,Cr")
    assert code == 0
    words = " ".join(out.split())
    assert "Ranked as an anode (generic): acceptable materials first" in words
    assert "Cautions" in out
    for heading in ("verdict", "surface", "p", "log c"):  # verdict, surface conduction and robustness, briefly
        assert heading in out


def test_screen_by_role_shows_the_role_criterion_and_fits_80_columns(capsys):
    code, out, _ = run(capsys, "screen", "--ph", "0:1", "--potential=-0.1:0", "--scale", "RHE", "--role", "her-cathode",
                       "--materials", "Pt,Hg,Ni", "--current-density", "10")
    assert code == 0
    assert "H2 V" in out and "vs RHE at 10 mA cm^-2" in " ".join(out.split())
    assert max(len(line) for line in out.splitlines()) <= 80


def test_screen_role_help_lists_every_role(capsys):
    from electrosieve.engine.roles import roles

    with pytest.raises(SystemExit):
        main(["screen", "--help"])
    joined = "".join(capsys.readouterr().out.split())  # argparse wraps help lines at hyphens
    assert all(name in joined for name in roles())


def test_screen_unknown_role_names_the_field(capsys):
    code, _, err = run(capsys, "screen", "--ph", "7", "--potential", "0", "--role", "anodes")
    assert code == 2 and "role must be one of" in err and "oer-anode" in err


def test_materials_and_sources_json(capsys):
    materials = run_json(capsys, "materials")
    assert len(materials) >= 40
    assert {"id", "name", "family", "price_usd_per_kg", "abundance_mg_per_kg", "hazards"} <= set(materials[0])
    sources = run_json(capsys, "sources", "cu")
    assert sources["element"] == "Cu"
    assert all(row["source"] in sources["citations"] for row in sources["species"])


@pytest.mark.parametrize("argv, message", [
    (["screen", "--ph", "5:1", "--potential", "0"], "inverted"),
    (["screen", "--ph", "1:", "--potential", "0"], "a number or a range"),
    (["screen", "--ph", "7", "--potential", "0", "--materials", "Pt,Nope"], "known materials"),
    (["screen", "--ph", "7", "--potential", "0", "--family", "shiny"], "unknown family"),
    (["screen", "--ph", "7", "--potential", "0", "--family", "noble", "--materials", "Pt"], "not both"),
    (["screen", "--ph", "7", "--potential", "0", "--json", "--csv"], "one of --json and --csv"),
    (["screen", "--ph", "7", "--potential", "0", "--accept", ","], "at least one region"),
    (["screen", "--ph", "7", "--potential", "0", "--weights", "price"], "--weights must look like"),
    (["screen", "--ph", "7", "--potential", "9"], "--potential must be between -5 and 5 V"),
    (["screen", "--ph", "7", "--potential", "0", "--scale", "NHE"], "unknown reference scale"),
    (["sources", "Xx"], "unknown element"),
])
def test_screen_bad_input(capsys, argv, message):
    code, out, err = run(capsys, *argv)
    assert code == 2, out
    assert message in err and "Traceback" not in err


def test_point_on_a_boundary_is_the_less_noble_side(capsys):
    # Zn/Zn2+ at 10^-6: E = -0.7621 + 0.02958 log(1e-6) = -0.9396 V (Nernst; E° from the catalog, -0.762 V in Bard 1985).
    from electrosieve.engine.diagram import diagram

    line = next(b for b in diagram("Zn").boundaries if {b.first.name, b.second.name} == {"Zn", "Zn^2+"})
    payload = run_json(capsys, "point", "Zn", "--ph", "3", f"--potential={line.intercept!r}")
    assert payload["region"] == "corrosion"


@pytest.mark.parametrize("extra", [[], ["--weights", "unacceptable:1,price:0.2"], ["--rank-by", "margin,price"]])
def test_screen_table_fits_80_columns_one_line_per_row(capsys, monkeypatch, extra):
    monkeypatch.setenv("COLUMNS", "80")
    code, out, err = run(capsys, "screen", "--ph", "0:1", "--potential", "1.4:1.8", "--scale", "RHE", *extra)
    assert code == 0, err
    lines = out.splitlines()
    assert all(len(line) <= 80 for line in lines), max(lines, key=len)
    rule = next(i for i, line in enumerate(lines) if line.startswith("--"))
    heading = lines[rule - 1].split()
    assert heading[:3] == ["#", "material", "verdict"] and heading[-1] == "reason"
    rows = list(itertools.takewhile(bool, lines[rule + 1:]))
    assert [int(line.split()[0]) for line in rows] == list(range(1, len(rows) + 1))  # one line per candidate
    assert len(rows) == len(default_catalog().materials)
    assert len(lines[rule].split()) <= 3 + 3 + 1  # rank, material, verdict, at most three figures, reason


def test_screen_table_wide_shows_every_column_unwrapped(capsys, monkeypatch):
    monkeypatch.setenv("COLUMNS", "80")
    code, out, _ = run(capsys, "screen", "--ph", "7", "--potential", "0.2", "--materials", "Pt,Zn,Cr", "--wide")
    assert code == 0
    lines = out.splitlines()
    rule = next(i for i, line in enumerate(lines) if line.startswith("-"))
    assert {"margin", "USD/kg", "ΔΦ", "immu", "corr"} <= set(lines[rule - 1].split())
    rows = lines[rule + 1:rule + 4]
    assert sorted(line.split()[1] for line in rows) == ["Cr", "Pt", "Zn"]
    assert not any("…" in line for line in rows)  # reasons whole, however wide the line
