"""The view state: the one parser of a screening scenario given as text, from the query string or the CLI.

- :func:`parse_number` is the only place text becomes a number (query string, form, CLI flags).
- :class:`ViewQuery` is every page's query string; :meth:`ViewQuery.scenario_in` turns it into the same
  :class:`app.models.ScenarioIn` a JSON body is validated into, and :func:`checked_scenario` turns either
  into the engine's checked :class:`engine.screen.Scenario`.
- :func:`cli_scenario` does the same for the ``electrosieve screen`` flags.

Every door therefore meets the same rules and the engine's same messages, each naming the field in the
door's own words (``ph_low`` in a URL, ``--ph`` on the command line).
"""

import math
import re
import sys

from pydantic import BaseModel, ConfigDict, ValidationError

from electrosieve.engine.catalog import Catalog
from electrosieve.engine.errors import InputError
from electrosieve.engine.kinetics import DEFAULT_CURRENT_DENSITY
from electrosieve.engine.screen import Scenario, make_scenario
from electrosieve.engine.solution import Solution, make_solution

from .models import FieldError, ScenarioIn
from .ranges import within


def parse_number(text, field: str, *, finite: bool = True) -> float:
    """``text`` as a finite number, or an :class:`InputError` naming ``field``; with ``finite=False`` NaN and
    infinities pass, for a caller whose own check names the field better (e.g. the engine's plot limits).

    >>> parse_number(" 1e-6 ", "activity")
    1e-06
    """
    try:
        value = float(str(text).strip())
    except (TypeError, ValueError):
        raise InputError(f"{field} must be a number (given {text!r})", field=field) from None
    if finite and not math.isfinite(value):
        raise InputError(f"{field} must be a finite number (given {text!r})", field=field)
    return value


def parse_range(text: str, field: str, kind: str | None = None) -> tuple[float, float]:
    """``"A:B"`` → (A, B); ``"A"`` → (A, A). Negative numbers work: ``--potential=-0.5:-0.2``. With ``kind``
    (``"ph"``, ``"potential"``) each end must lie in that kind's range, as the API's models require
    (``app.ranges``); order is the engine's check, which names the scenario's own field.

    >>> parse_range("-0.5:-0.2", "--potential")
    (-0.5, -0.2)
    """
    parts = str(text).split(":")
    if len(parts) not in (1, 2) or not all(p.strip() for p in parts):
        raise InputError(f"{field} must be a number or a range A:B (given {text!r})", field=field)
    try:
        values = [parse_number(p, field, finite=False) for p in parts]
    except InputError:
        raise InputError(f"{field} must be a number or a range A:B of numbers (given {text!r})", field=field) from None
    if kind is not None:
        values = [within(value, field, kind) for value in values]
    return values[0], values[-1]


WEIGHTS_EXAMPLE = "unacceptable:1,price:0.2"


def parse_weights(text: str, field: str = "weights") -> dict[str, float]:
    """Ranking weights written ``key:weight,…`` (the one spelling in URLs and on the CLI).

    ``key=weight`` is the CLI's old spelling: still read, with a warning on stderr (see :func:`deprecated`).

    >>> parse_weights("unacceptable:1, price:0.2")
    {'unacceptable': 1.0, 'price': 0.2}
    """
    weights = {}
    for part in text.split(","):
        key, sep, value = part.replace("=", ":").partition(":")
        key = key.strip().lower()
        if not sep or not value.strip():
            raise InputError(f"{field} must look like {WEIGHTS_EXAMPLE} (given {text!r})", field=field)
        weights[key] = parse_number(value, f"{field} {key}")
    if "=" in text:
        deprecated(f"{field} written key=weight", f"key:weight ({WEIGHTS_EXAMPLE})")
    return weights


ION_ACTIVITY_EXAMPLE = "Cu^2+=0.1"


def parse_ion_activities(texts, field: str = "ion_activities") -> dict[str, float] | None:
    """Per-ion activities written ``NAME=A`` (repeated, or comma-separated in one text); None when none given.

    >>> parse_ion_activities(["Cu^2+=0.1", "Ni^2+=1e-3,Zn^2+=0.01"])
    {'Cu^2+': 0.1, 'Ni^2+': 0.001, 'Zn^2+': 0.01}
    """
    found: dict[str, float] = {}
    for text in [texts] if isinstance(texts, str) else list(texts or []):
        for part in str(text).split(","):
            if not part.strip():
                continue
            name, sep, value = part.rpartition("=")
            if not sep or not name.strip() or not value.strip():
                raise InputError(f"{field} must look like {ION_ACTIVITY_EXAMPLE} (given {part.strip()!r})", field=field)
            found[name.strip()] = parse_number(value, f"{field} {name.strip()}")
    return found or None


def cli_solution(*, electrolyte: str | None, ion_activity: list[str] | None, chloride: str | None, temperature: float,
                 ph=None, catalog: Catalog) -> Solution:
    """The dissolved conditions of ``--electrolyte``, ``--ion-activity`` (repeated) and ``--chloride`` (text)."""
    return make_solution(catalog=catalog, temperature_c=temperature, ph=ph, electrolyte=electrolyte,
                         ion_activities=parse_ion_activities(ion_activity, "--ion-activity"),
                         chloride=None if chloride is None else parse_number(chloride, "--chloride"))


def parse_list(text: str | None) -> list[str] | None:
    """Comma-separated words, blanks dropped; None stays None."""
    return None if text is None else [part.strip() for part in text.split(",") if part.strip()]


def deprecated(old: str, new: str) -> None:
    """Tell a CLI user on stderr that ``old`` still works for this release and ``new`` replaces it."""
    print(f"warning: {old} is deprecated and will be removed in the next release; use {new}", file=sys.stderr)


def checked_scenario(scenario: ScenarioIn, catalog: Catalog) -> Scenario:
    """The engine's checked scenario for a validated request (raises the engine's :class:`InputError`)."""
    return make_scenario(**scenario.engine_arguments(), catalog=catalog)


def cli_scenario(*, ph: str | None, potential: str, scale: str, activity: str, temperature: str, role: str,
                 accept: str | None, materials: str | None, family: str | None, rank_by: str | None,
                 weights: str | None, catalog: Catalog, electrolyte: str | None = None,
                 ion_activity: list[str] | None = None, chloride: str | None = None,
                 current_density: str = str(DEFAULT_CURRENT_DENSITY)) -> Scenario:
    """The scenario of ``electrosieve screen``'s flags (all text), checked by the engine; without ``--ph`` the
    ``--electrolyte`` recipe's pH is used."""
    accepted = parse_list(accept)
    if accepted is not None and not accepted:
        raise InputError("--accept must name at least one region", field="--accept")
    weighed = None if weights is None else {key: within(weight, f"--weights {key}", "weight")
                                            for key, weight in parse_weights(weights, "--weights").items()}
    return make_scenario(
        ph=None if ph is None else list(parse_range(ph, "--ph", kind="ph")),
        potential=list(parse_range(potential, "--potential", kind="potential")), scale=scale,
        activity=parse_number(activity, "--activity"), temperature=parse_number(temperature, "--temperature"),
        role=role, accept=accepted, materials=parse_list(materials), family=family, rank_by=parse_list(rank_by),
        weights=weighed, catalog=catalog,
        electrolyte=electrolyte, ion_activities=parse_ion_activities(ion_activity, "--ion-activity"),
        chloride=None if chloride is None else parse_number(chloride, "--chloride"),
        current_density=parse_number(current_density, "--current-density"))


UNION_TAG = re.compile(r"^(float|int|str|bool|none|list\[.*\]|dict\[.*\]|literal\[.*\]|function-.*|constrained-.*)$")


def field_errors(error: ValidationError, where: str, rename: dict | None = None, flat: bool = False) -> list[FieldError]:
    """Pydantic's errors as FieldErrors: one per field, the field named in the message.

    ``where`` is the first ``loc`` item ("body", "query"); union branch tags (``float``,
    ``list[float]``) are dropped from the location and duplicates merged. ``flat`` keeps only
    the top-level field (a query parameter, not the item of a list it was split into).
    """
    rename = rename or {}
    seen: dict[tuple, FieldError] = {}
    for item in error.errors(include_url=False, include_input=False, include_context=False):
        loc = [part for part in item["loc"] if not (isinstance(part, str) and UNION_TAG.match(part))]
        if loc and loc[0] in rename:
            loc[0] = rename[loc[0]]
        if flat:
            loc = loc[:1]
        key = tuple(loc)
        if key in seen:
            continue
        name = ".".join(str(part) for part in loc) or where
        seen[key] = FieldError(loc=[where, *loc], msg=f"{name}: {item['msg']}", type=item["type"])
    return list(seen.values())


SCENARIO_PARAMS = ("ph_low", "ph_high", "potential_low", "potential_high", "scale", "temperature", "activity",
                   "role", "accept", "pick", "family", "materials", "rank_by", "weights", "electrolyte",
                   "ion_activities", "chloride", "current_density")
LIST_PARAMS = ("accept", "materials", "compare")

ENGINE_FIELD_TO_PARAM = {"ph": "ph_low", "potential": "potential_low", "materials": "materials"}
"""Where an engine error on a scenario field points in the query string."""


class ViewQuery(BaseModel):
    """Every page's view state as it appears in the query string (all text, parsed by :meth:`scenario_in`).

    A pH or potential range is ``*_low`` and ``*_high`` (an empty ``*_high`` means a point); candidates
    are ``pick=all|family|names`` with ``family=…`` or repeated ``materials=…``; ``rank_by`` is a
    comma-separated order, ``weights`` ``key:weight,…``; the compare page adds repeated ``compare=…``
    and ``axis`` (the potential scale of the plots). A query string with no scenario parameter at all
    means :data:`DEFAULT_VIEW`.
    """

    model_config = ConfigDict(extra="ignore")

    ph_low: str = ""
    ph_high: str = ""
    potential_low: str = ""
    potential_high: str = ""
    scale: str = "SHE"
    temperature: str = "25"
    activity: str = "1e-6"
    role: str = "anode"
    accept: list[str] = []
    pick: str = ""
    family: str = ""
    materials: list[str] = []
    rank_by: str = ""
    weights: str = ""
    compare: list[str] = []
    axis: str = ""
    electrolyte: str = ""
    ion_activities: str = ""
    chloride: str = ""
    current_density: str = ""

    @classmethod
    def from_params(cls, params) -> "ViewQuery":
        """From a multi-valued mapping (Starlette's ``QueryParams`` or a form); extra keys are ignored."""
        getlist = getattr(params, "getlist", None)
        values: dict[str, str | list[str]] = {}
        for name in cls.model_fields:
            if getlist is not None:
                found = [str(v) for v in getlist(name)]
            else:
                raw = params.get(name)
                found = [] if raw is None else ([str(v) for v in raw] if isinstance(raw, (list, tuple)) else [str(raw)])
            if not found:
                continue
            values[name] = [v.strip() for v in found if v.strip()] if name in LIST_PARAMS else found[-1].strip()
        if not any(name in values for name in SCENARIO_PARAMS):
            values = {**DEFAULT_VIEW.model_dump(include=set(SCENARIO_PARAMS)), **values}
        return cls(**values)

    @classmethod
    def from_scenario(cls, echo: dict) -> "ViewQuery":
        """The view that reproduces an engine scenario echo (for "Start from this" links)."""
        def pair(value):
            if isinstance(value, (list, tuple)):
                low, high = value[0], value[-1]
                return _number_text(low), ("" if high == low else _number_text(high))
            return _number_text(value), ""

        ph_low, ph_high = pair(echo["ph"])
        e_low, e_high = pair(echo["potential"])
        materials = echo.get("materials") or []
        family = echo.get("family") or ""
        rank_by = echo.get("rank_by") or []
        return cls(
            ph_low=ph_low, ph_high=ph_high, potential_low=e_low, potential_high=e_high, scale=echo["scale"],
            temperature=_number_text(echo["temperature"]), activity=_number_text(echo["activity"]),
            role=echo["role"], accept=list(echo.get("accept") or []),
            pick="names" if materials else ("family" if family else "all"), family=family, materials=list(materials),
            rank_by=",".join(rank_by),
            weights=",".join(f"{k}:{_number_text(v)}" for k, v in (echo.get("weights") or {}).items()),
            electrolyte=echo.get("electrolyte") or "",
            ion_activities=",".join(f"{k}={_number_text(v)}" for k, v in (echo.get("ion_activities") or {}).items()),
            chloride="" if echo.get("chloride") is None else _number_text(echo["chloride"]),
            current_density="" if echo.get("current_density", DEFAULT_CURRENT_DENSITY) == DEFAULT_CURRENT_DENSITY
            else _number_text(echo["current_density"]),
        )

    def params(self, *, scenario_only: bool = False) -> list[tuple[str, str]]:
        """The query string's (name, value) pairs in a fixed order; empty values left out except ``*_high``."""
        pairs: list[tuple[str, str]] = []
        names = SCENARIO_PARAMS if scenario_only else tuple(self.model_fields)
        for name in names:
            value = getattr(self, name)
            if isinstance(value, list):
                pairs.extend((name, v) for v in value)
            elif value or name in ("ph_high", "potential_high"):
                pairs.append((name, value))
        return pairs

    def form_values(self) -> dict[str, str | list[str]]:
        return self.model_dump()

    def picked(self) -> str:
        """How candidates are chosen: ``all``, ``family`` or ``names``."""
        if self.pick in ("all", "family", "names"):
            return self.pick
        return "names" if self.materials else ("family" if self.family else "all")

    def scenario_in(self) -> tuple["ScenarioIn | None", list[FieldError]]:
        """The scenario this view asks for, or the errors, each naming its query parameter."""
        errors: list[FieldError] = []

        def number(name: str, required: bool = True):
            text = getattr(self, name)
            if not text:
                if required:
                    errors.append(FieldError(loc=["query", name], msg=f"{name}: a number is required"))
                return None
            try:
                return parse_number(text, name)
            except InputError as error:
                errors.append(FieldError(loc=["query", name], msg=error.message))
                return None

        ph_low, ph_high = number("ph_low", required=not self.electrolyte), number("ph_high", required=False)
        e_low, e_high = number("potential_low"), number("potential_high", required=False)
        temperature, activity = number("temperature"), number("activity")
        chloride = number("chloride", required=False)
        ion_activities = None
        try:
            ion_activities = parse_ion_activities(self.ion_activities, "ion_activities")
        except InputError as error:
            errors.append(FieldError(loc=["query", "ion_activities"], msg=error.message))
        current_density = number("current_density", required=False)
        weights = None
        if self.weights:
            try:
                weights = _query_weights(self.weights)
            except InputError:
                errors.append(FieldError(loc=["query", "weights"],
                                         msg=f"weights: write key:weight pairs such as {WEIGHTS_EXAMPLE} (given {self.weights!r})"))
        picked = self.picked()
        if picked == "names" and not self.materials:
            errors.append(FieldError(loc=["query", "materials"], msg="materials: tick at least one material, or pick all"))
        if picked == "family" and not self.family:
            errors.append(FieldError(loc=["query", "family"], msg="family: choose a family, or pick all"))
        if errors:
            return None, errors
        candidate = {
            "ph": ph_low if ph_high is None else [ph_low, ph_high],
            "potential": e_low if e_high is None else [e_low, e_high],
            "scale": self.scale or "SHE", "temperature": temperature, "activity": activity,
            "role": self.role.lower(), "accept": [a.lower() for a in self.accept] or None,
            "materials": self.materials if picked == "names" else None,
            "family": self.family if picked == "family" else None,
            "rank_by": [k.strip().lower() for k in self.rank_by.split(",") if k.strip()] or None,
            "weights": weights,
            "electrolyte": self.electrolyte or None, "ion_activities": ion_activities, "chloride": chloride,
            **({} if current_density is None else {"current_density": current_density}),
        }
        if ph_low is None:
            candidate["ph"] = None if ph_high is None else ph_high
        try:
            return ScenarioIn.model_validate(candidate), []
        except ValidationError as error:
            return None, field_errors(error, "query", rename={"ph": "ph_low", "potential": "potential_low"}, flat=True)


def _number_text(value) -> str:
    """A number as short text that parses back to the same float."""
    return repr(float(value)).removesuffix(".0") if float(value).is_integer() else repr(float(value))


DEFAULT_VIEW = ViewQuery(ph_low="0", ph_high="1", potential_low="1.4", potential_high="1.8", scale="RHE",
                         temperature="25", activity="1e-6", role="anode", pick="all")
"""The screen page's first view: an acid water-electrolyser anode, 1.4 to 1.8 V vs RHE at pH 0 to 1 (an example)."""


def _query_weights(text: str) -> dict[str, float]:
    """Weights from a URL, where ``key=weight`` was always read too (no warning: no one is there to read it)."""
    return parse_weights(text.replace("=", ":"), "weights")
