"""The ``electrosieve`` command line: diagrams, point queries, scale conversion, catalog listings, screening, serving.

Every command accepts ``--json`` for machine-readable output and ``--overlay DIR``
to lay a user's own species files over the built-in catalog. Errors are one
readable line on stderr and a non-zero exit (2 for bad input), never a traceback.
"""

import argparse
import json
import sys
from pathlib import Path

from electrosieve.engine.catalog import Catalog, default_catalog, load_catalog
from electrosieve.engine.diagram import PlotLimits, diagram, stable_at
from electrosieve.engine.electrolyte import electrolyte
from electrosieve.engine.inputs import DEFAULT_ACTIVITY, check_temperature
from electrosieve.engine.errors import ElectrosieveError, InputError
from electrosieve.engine.scales import canonical_scale, convert, needs_ph
from electrosieve.engine.roles import roles
from electrosieve.engine.screen import screen

from . import csvcells, payloads
from .clitable import legend, screen_columns, table_lines
from .ranges import within
from .viewstate import cli_scenario, cli_solution, deprecated, parse_number, parse_range

EXIT_BAD_INPUT = 2
EXIT_INTERNAL = 1


class UsageError(Exception):
    """A command line that argparse rejected."""


class _Parser(argparse.ArgumentParser):
    def error(self, message):  # argparse calls this on bad usage
        raise UsageError(f"{self.prog}: {message}")


def _whole_number(text: str, field: str, low: int, high: int) -> int:
    """``text`` as a whole number within [low, high], or an error naming ``field``."""
    try:
        value = int(str(text).strip())
    except ValueError:
        raise InputError(f"{field} must be a whole number (given {text!r})", field=field) from None
    if not low <= value <= high:
        raise InputError(f"{field} must be between {low} and {high} (given {value})", field=field)
    return value


class _Renamed(argparse.Action):
    """An option's old spelling: still read for one release, with a warning on stderr naming the new one."""

    def __init__(self, option_strings, dest, new: str = "", **kwargs):
        self.new = new
        super().__init__(option_strings, dest, **{**kwargs, "help": argparse.SUPPRESS})

    def __call__(self, parser, namespace, values, option_string=None):
        deprecated(option_string, self.new)
        setattr(namespace, self.dest, values)


def _catalog(args) -> Catalog:
    return load_catalog(overlay=Path(args.overlay)) if getattr(args, "overlay", None) else default_catalog()


def _limits(args) -> PlotLimits:
    ph = parse_range(args.ph_limits, "--ph-limits", kind="ph")
    e = parse_range(args.potential_limits, "--potential-limits", kind="potential")
    return PlotLimits(ph_min=ph[0], ph_max=ph[1], e_min=e[0], e_max=e[1])


def _emit(args, payload, human) -> None:
    if args.json:
        print(json.dumps(payload, indent=2, ensure_ascii=False))
    else:
        human(payload)


def _console():
    from rich.console import Console

    return Console()


def _solution(args, temperature: float, ph=None):
    return cli_solution(electrolyte=args.electrolyte, ion_activity=args.ion_activity, chloride=args.chloride,
                        temperature=temperature, ph=ph, catalog=_catalog(args))


def _print_solution(payload: dict, console=None) -> None:
    """The recipe's pH and ionic strength, the per-ion activities, chloride and the warnings, if any."""
    console = console or _console()
    recipe = payload.get("electrolyte")
    if recipe:
        console.print(f"Electrolyte {recipe['recipe']}: pH {recipe['ph']:.2f} at {recipe['temperature_c']:g} °C, "
                      f"ionic strength {recipe['ionic_strength']:.3g} mol/kg ({recipe['model']}).")
    if payload.get("ion_activities"):
        console.print("Ion activities: " + ", ".join(f"{k} {v:g}" for k, v in payload["ion_activities"].items()))
    if payload.get("chloride") is not None:
        console.print(f"Free chloride activity {payload['chloride']:g}.")
    for warning in payload.get("warnings", []):
        console.print(f"[bold]warning[/bold]: {warning}")
    if recipe:
        for caution in recipe["cautions"]:
            console.print(f" - {caution}")


def cmd_diagram(args) -> None:
    catalog = _catalog(args)
    temperature = check_temperature(parse_number(args.temperature, "--temperature"))
    solution = _solution(args, temperature)
    result = diagram(args.element, parse_number(args.activity, "--activity"), temperature,
                     _limits(args), catalog=catalog, **solution.diagram_arguments())
    payload = payloads.diagram_payload(result, catalog, solution)
    if args.out:
        from .figures import diagram_figure, write_figure

        try:
            write_figure(diagram_figure(payload), args.out)
        except ValueError as error:
            raise InputError(str(error), field="--out") from None
        except Exception as error:  # image export needs kaleido and Chromium
            raise InputError(f"could not write {args.out}: {error}", field="--out") from None
    _emit(args, payload, _print_diagram)


def _print_diagram(payload: dict) -> None:
    from rich.table import Table

    console = _console()
    table = Table(title=f"{payload['element']}: stability domains (activity {payload['activity']:g}, "
                        f"{payload['temperature_c']:g} °C; E vs SHE)")
    for column in ("species", "phase", "region", "area / pH·V"):
        table.add_column(column)
    for d in payload["domains"]:
        table.add_row(d["formula"], d["phase"], d["region"], f"{d['area']:.3f}")
    console.print(table)
    lines = Table(title="boundaries")
    lines.add_column("between")
    lines.add_column("line (V vs SHE)")
    for b in payload["boundaries"]:
        lines.add_row(" | ".join(b["species"]), b["equation"])
    lines.add_row("H2/H2O (1 bar)", payload["water"]["hydrogen"]["equation"])
    lines.add_row("O2/H2O (1 bar)", payload["water"]["oxygen"]["equation"])
    console.print(lines)
    console.print(f"{payload['conditions']} Neutral pH {payload['water']['neutral_ph']:.2f}.")
    for note in payload["temperature_notes"]:
        console.print(f" - {note}")
    _print_solution(payload, console)


def cmd_point(args) -> None:
    catalog = _catalog(args)
    temperature = check_temperature(parse_number(args.temperature, "--temperature"))
    ph = within(parse_number(args.ph, "--ph"), "--ph", "ph")
    potential = within(parse_number(args.potential, "--potential"), "--potential", "potential")
    solution = _solution(args, temperature, ph)
    result = diagram(args.element, parse_number(args.activity, "--activity"), temperature, _limits(args), catalog=catalog,
                     **solution.diagram_arguments())
    payload = payloads.point_payload(stable_at(result, catalog.scales, ph, potential, args.scale), solution)

    def human(p):
        print(f"{p['element']} at pH {p['ph']:g}, {p['potential']:g} V vs {p['scale']} ({p['potential_she']:.3f} V vs SHE): "
              f"{p['formula']} ({p['phase']}) - {p['region']}")
        _print_solution(p)

    _emit(args, payload, human)


def cmd_convert(args) -> None:
    catalog = _catalog(args)
    temperature = check_temperature(parse_number(args.temperature, "--temperature"))
    value = within(parse_number(args.value, "VALUE"), "VALUE", "potential")
    source = canonical_scale(catalog.scales, args.source)
    target = canonical_scale(catalog.scales, args.target)
    ph = None if args.ph is None else within(parse_number(args.ph, "--ph"), "--ph", "ph")
    if ph is None and (needs_ph(catalog.scales, source) or needs_ph(catalog.scales, target)):
        raise InputError("converting to or from the RHE needs --ph", field="--ph")
    result = convert(catalog.scales, value, source, target, ph, temperature + 273.15)
    payload = {"value": round(result, 9), "scale": target, "input": {"value": value, "scale": source, "ph": ph,
                                                                     "temperature_c": temperature}}
    _emit(args, payload, lambda p: print(f"{value:g} V vs {source} = {p['value']:.4f} V vs {target}"))


def cmd_scales(args) -> None:
    catalog = _catalog(args)
    payload = payloads.scales_payload(catalog)

    def human(rows):
        from rich.table import Table

        table = Table(title="reference scales (potential vs SHE at 25 °C)")
        for column in ("id", "electrode", "E vs SHE / V", "source"):
            table.add_column(column)
        for row in rows:
            shown = "0 - 0.0592·pH" if row["ph_dependent"] else f"{row['potential_vs_she']:+.4f}"
            table.add_row(row["id"], row["name"], shown, row["source"])
        _console().print(table)

    _emit(args, payload, human)


def write_csv(result: dict, stream) -> None:
    csvcells.write_csv(stream, payloads.CSV_COLUMNS, payloads.csv_rows(result))


def cmd_screen(args) -> None:
    catalog = _catalog(args)
    if args.json and args.csv:
        raise InputError("choose one of --json and --csv", field="--csv")
    scenario = cli_scenario(ph=args.ph, potential=args.potential, scale=args.scale, activity=args.activity,
                            temperature=args.temperature, role=args.role, accept=args.accept,
                            materials=args.materials, family=args.family, rank_by=args.rank_by,
                            weights=args.weights, catalog=catalog, electrolyte=args.electrolyte,
                            ion_activity=args.ion_activity, chloride=args.chloride,
                            current_density=args.current_density)
    result = payloads.screen_payload(screen(scenario, catalog))
    if args.csv:
        write_csv(result, sys.stdout)
        return
    _emit(args, result, lambda payload: _print_screen(payload, wide=args.wide))


def _print_screen(result: dict, wide: bool = False) -> None:
    import shutil
    import textwrap

    s = result["scenario"]
    console = _console()
    width = shutil.get_terminal_size().columns
    span = lambda v: f"{v[0]:g} to {v[1]:g}" if isinstance(v, list) else f"{v:g}"  # noqa: E731
    title = (f"{s['role']} at pH {span(s['ph'])}, {span(s['potential'])} V vs {s['scale']}, {s['temperature']:g} °C, "
             f"dissolved species at {s['activity']:g}; acceptable: {', '.join(s['accept'])}")
    columns = screen_columns(result, wide)
    lines = table_lines(columns, result["results"], width=None if wide else width)
    print("\n".join([*textwrap.wrap(title, width), "", *lines, "", *textwrap.wrap(legend(columns, result), width), "",
                      *textwrap.wrap(result["rule"], width)]))
    noted = [(row["material"], n) for row in result["results"][:10] for n in row["notes"] if n["kind"] != "kinetic"]
    for material, note in noted:
        console.print(f"[bold]{note['kind']}[/bold] {material}: {note['text']} ({note['source']})")
    console.print(f"{result['conditions']} Neutral pH {result['neutral_ph']:.2f}.")
    if result["temperature_notes"]:
        console.print("Approximations used away from 25 °C (see `electrosieve diagram ELEMENT --temperature T`): "
                      f"{sum(len(v) for v in result['temperature_notes'].values())} species notes in --json output.")
    flagged = [(row["material"], h) for row in result["results"] for h in row["hazards"] if h["kind"] == "toxic"]
    for material, hazard in flagged:
        console.print(f"[bold]hazard[/bold] {material}: {hazard['species']} - {hazard['note']}")
    gas = {h["species"]: h["note"] for row in result["results"] for h in row["hazards"] if h["kind"] == "gas"}
    for note in gas.values():
        console.print(f"[bold]gas[/bold]: {note}")
    cautions = {row["material"]: row["caution"] for row in result["results"] if row.get("caution")}
    for material, caution in cautions.items():
        console.print(f"[bold]caution[/bold] {material}: {caution}")
    if result.get("electrolyte"):
        e = result["electrolyte"]
        console.print(f"Electrolyte {e['recipe']}: pH {e['ph']:.2f} at {e['temperature_c']:g} °C, "
                      f"ionic strength {e['ionic_strength']:.3g} mol/kg ({e['model']}).")
    for warning in result.get("warnings", []):
        console.print(f"[bold]warning[/bold]: {warning}")
    console.print("Cautions:")
    for caution in result["cautions"] + (result["electrolyte"]["cautions"] if result.get("electrolyte") else []):
        console.print(f" - {caution}")


def cmd_materials(args) -> None:
    catalog = _catalog(args)
    payload = payloads.materials_payload(catalog)

    def human(rows):
        from rich.table import Table

        table = Table(title=f"{len(rows)} candidate materials")
        for column in ("id", "name", "family", "phase", "USD/kg (year)", "crust mg/kg", "hazards"):
            table.add_column(column, overflow="fold")
        for row in rows:
            price = "-" if row["price_usd_per_kg"] is None else f"{row['price_usd_per_kg']:,.2f} ({row['price_year']})"
            crust = "-" if row["abundance_mg_per_kg"] is None else f"{row['abundance_mg_per_kg']:g}"
            table.add_row(row["id"], row["name"], row["family"], row["phase"], price, crust,
                          ", ".join(h["species"] for h in row["hazards"]))
        _console().print(table)

    _emit(args, payload, human)


def cmd_sources(args) -> None:
    catalog = _catalog(args)
    payload = payloads.sources_payload(catalog, catalog.system(args.element).element)

    def human(p):
        from rich.table import Table

        table = Table(title=f"{p['element']}: species data and their sources")
        for column in ("species", "phase", "ΔGf° kJ/mol", "ΔHf° kJ/mol", "S° J/(mol K)", "source", "memory", "note"):
            table.add_column(column, overflow="fold")
        fmt = lambda v: "-" if v is None else f"{v:g}"  # noqa: E731
        for row in p["species"]:
            table.add_row(row["formula"], row["phase"], fmt(row["dgf"]), fmt(row["dhf"]), fmt(row["s"]), row["source"],
                          "yes" if row["from_memory"] else "", row["note"])
        console = _console()
        console.print(table)
        for key, text in p["citations"].items():
            console.print(f"[bold]{key}[/bold]: {text}")

    _emit(args, payload, human)


def cmd_electrolyte(args) -> None:
    payload = payloads.electrolyte_payload(
        electrolyte(args.recipe, check_temperature(parse_number(args.temperature, "--temperature")), "RECIPE"))

    def human(p):
        console = _console()
        console.print(f"{p['recipe']} at {p['temperature_c']:g} °C: pH {p['ph']:.2f}, "
                      f"ionic strength {p['ionic_strength']:.3g} mol/kg, water activity {p['water_activity']:.3f}")
        from rich.table import Table

        table = Table(title="free ions")
        for column in ("ion", "mol/kg", "activity"):
            table.add_column(column)
        for ion, activity in p["activities"].items():
            table.add_row(ion, f"{p['molalities'][ion]:.3g}", f"{activity:.3g}")
        console.print(table)
        console.print(f"Model: {p['model']}; valid for {p['validity']}.")
        for warning in p["warnings"]:
            console.print(f"[bold]warning[/bold]: {warning}")
        console.print("Cautions:")
        for caution in p["cautions"]:
            console.print(f" - {caution}")

    _emit(args, payload, human)


def cmd_serve(args) -> None:
    from .server import serve

    serve(host=args.host, port=_whole_number(args.port, "--port", 1, 65535),
          workers=_whole_number(args.workers, "--workers", 1, 64), data_dir=args.store)


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(prog="electrosieve", description=__doc__.splitlines()[0])
    commands = parser.add_subparsers(dest="command", required=True, parser_class=_Parser)

    def common(sub, diagram_options=True):
        sub.add_argument("--json", action="store_true", help="print JSON instead of a table")
        sub.add_argument("--overlay", metavar="DIR", help="a directory of your own species files laid over the built-in catalog")
        sub.add_argument("--data", dest="overlay", action=_Renamed, new="--overlay")
        if diagram_options:
            sub.add_argument("--activity", default=str(DEFAULT_ACTIVITY), help="activity of dissolved species (1e-8 to 1; default 1e-6)")
            sub.add_argument("--temperature", default="25", help="temperature in °C (default 25)")
            sub.add_argument("--ph-limits", default="-2:16", metavar="A:B", help="pH limits of the diagram (default -2:16)")
            sub.add_argument("--potential-limits", default="-3:3", metavar="X:Y",
                             help="potential limits of the diagram, vs SHE [V] (default -3:3)")
            sub.add_argument("--window-ph", dest="ph_limits", action=_Renamed, new="--ph-limits")
            sub.add_argument("--window-potential", dest="potential_limits", action=_Renamed, new="--potential-limits")
            solution_options(sub)

    def solution_options(sub):
        sub.add_argument("--electrolyte", metavar="RECIPE", help="electrolyte recipe, e.g. '0.6 M NaCl', 'seawater' "
                         "(see `electrosieve electrolyte`): sets its ions' and chloride's activities")
        sub.add_argument("--ion-activity", action="append", metavar="ION=A",
                         help="activity of one dissolved species, e.g. 'Cu^2+=0.1' (repeatable)")
        sub.add_argument("--chloride", metavar="A", help="free chloride activity (adds chloride complexes and salts)")

    sub = commands.add_parser("diagram", help="the exact E-pH diagram of one element")
    sub.add_argument("element")
    sub.add_argument("--out", metavar="FILE", help="also write the figure: .svg, .png or .html")
    common(sub)
    sub.set_defaults(handler=cmd_diagram)

    sub = commands.add_parser("point", help="the stable species at one pH and potential")
    sub.add_argument("element")
    sub.add_argument("--ph", required=True)
    sub.add_argument("--potential", required=True, help="potential [V] on --scale (use --potential=-0.5 for negatives)")
    sub.add_argument("--scale", default="SHE", help="reference scale of --potential (see `electrosieve scales`)")
    common(sub)
    sub.set_defaults(handler=cmd_point)

    sub = commands.add_parser("convert", help="convert a potential between reference scales")
    sub.add_argument("value")
    sub.add_argument("--from", dest="source", required=True)
    sub.add_argument("--to", dest="target", required=True)
    sub.add_argument("--ph", help="pH (needed for the RHE)")
    sub.add_argument("--temperature", default="25", help="temperature in °C (default 25)")
    common(sub, diagram_options=False)
    sub.set_defaults(handler=cmd_convert)

    sub = commands.add_parser("scales", help="list the reference scales")
    common(sub, diagram_options=False)
    sub.set_defaults(handler=cmd_scales)

    sub = commands.add_parser("screen", help="rank candidate materials over an operating window")
    sub.add_argument("--ph", metavar="A[:B]", help="pH point or range (default: the --electrolyte recipe's pH)")
    sub.add_argument("--potential", required=True, metavar="X[:Y]", help="potential point or range [V] on --scale")
    sub.add_argument("--scale", default="SHE", help="reference scale of --potential (default SHE)")
    sub.add_argument("--activity", default=str(DEFAULT_ACTIVITY), help="activity of dissolved species (default 1e-6)")
    sub.add_argument("--temperature", default="25", help="temperature in °C (default 25)")
    sub.add_argument("--role", default="anode", metavar="ROLE",
                     help=f"electrode role: {', '.join(roles())} (default anode; see the README for each role's criteria)")
    sub.add_argument("--current-density", default="1", metavar="MA_CM2",
                     help="current density at which each material's hydrogen and oxygen onsets are read [mA cm^-2] (default 1)")
    sub.add_argument("--accept", metavar="REGIONS", help="acceptable regions, e.g. immunity,passivation "
                     "(default: immunity for a cathode, immunity and passivation for an anode)")
    sub.add_argument("--materials", metavar="IDS", help="comma-separated material ids (default: all)")
    sub.add_argument("--family", help="only this family, e.g. noble")
    sub.add_argument("--rank-by", metavar="KEYS", help="ranking order, e.g. unacceptable,instability,dissolved,price")
    sub.add_argument("--weights", metavar="KEY:W,...", help="rank by a weighted score instead, e.g. unacceptable:1,price:0.2")
    sub.add_argument("--csv", action="store_true", help="print the ranked rows as CSV")
    solution_options(sub)
    sub.add_argument("--wide", action="store_true", help="show every column (default: the deciding figures, fitted to the terminal)")
    common(sub, diagram_options=False)
    sub.set_defaults(handler=cmd_screen)

    sub = commands.add_parser("materials", help="list the candidate materials with price, abundance and hazards")
    common(sub, diagram_options=False)
    sub.set_defaults(handler=cmd_materials)

    sub = commands.add_parser("sources", help="an element's species data with their citations")
    sub.add_argument("element")
    common(sub, diagram_options=False)
    sub.set_defaults(handler=cmd_sources)

    sub = commands.add_parser("electrolyte", help="pH, ionic strength and ion activities of an electrolyte recipe")
    sub.add_argument("recipe", metavar="RECIPE", help="e.g. '1 M KOH', '30 wt%% KOH', '0.5 M H2SO4 + 0.1 M CuSO4', "
                     "'seawater' (grammar: DEVELOPERS.md)")
    sub.add_argument("--temperature", default="25", help="temperature in °C (default 25)")
    sub.add_argument("--json", action="store_true", help="print JSON instead of a table")
    sub.set_defaults(handler=cmd_electrolyte)

    sub = commands.add_parser("serve", help="run the web app")
    sub.add_argument("--host", default="127.0.0.1")
    sub.add_argument("--port", default="8000")
    sub.add_argument("--workers", default="1", help="worker processes (default 1)")
    sub.add_argument("--store", metavar="DIR", help="where shortlists are stored (default: $ELECTROSIEVE_DATA_DIR or ./var)")
    sub.add_argument("--data-dir", dest="store", action=_Renamed, new="--store")
    sub.set_defaults(handler=cmd_serve)
    return parser


def main(argv: list[str] | None = None) -> int:
    """Run one command; return its exit code (0 ok, 2 bad input, 1 unexpected failure)."""
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
        args.handler(args)
        return 0
    except UsageError as error:
        print(f"error: {error}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except ElectrosieveError as error:
        print(f"error: {error}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except BrokenPipeError:
        return 0
    except Exception as error:  # last resort: never show a traceback to a user
        print(f"error: unexpected failure ({type(error).__name__}: {error}); please report it", file=sys.stderr)
        return EXIT_INTERNAL


def run() -> None:
    """Console-script entry point."""
    sys.exit(main())


if __name__ == "__main__":
    run()
