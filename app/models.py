"""Request and response models of the web app, in layers per resource.

Requests are strict: unknown fields, wrong types, booleans for numbers, NaN and
infinities are refused with a 422 naming the field. Bounds come from the engine
(``engine.diagram``, ``engine.domains.Window``) so the API and the engine agree;
the engine still makes the final checks (e.g. a potential window that leaves the
diagram once converted to the SHE) and its errors name their field too.

Responses mirror the JSON the CLI prints (``app.payloads``).
"""

import math
import re
from typing import Annotated, Literal

from pydantic import AfterValidator, BaseModel, ConfigDict, Field, StringConstraints, ValidationError, WithJsonSchema
from pydantic_core import PydanticCustomError

from electrosieve.engine.diagram import ACTIVITY_RANGE, DEFAULT_ACTIVITY, TEMPERATURE_RANGE_C
from electrosieve.engine.domains import Window
from electrosieve.engine.materials import FAMILIES
from electrosieve.engine.ranking import DEFAULT_ORDER, RANK_KEYS
from electrosieve.engine.screen import REGIONS, ROLES

from .storage import NOTE_MAX, TITLE_MAX
from .shapes import POINT_OR_PAIR
from .textrules import pattern_refusing, refused_characters

PLOT = Window()
"""The diagram window every screen uses (pH and E vs SHE limits)."""

POTENTIAL_LIMIT = 5.0
"""Loose bound on an input potential on any scale [V]; the engine checks the exact window after conversion."""

MATERIALS_MAX = 500
"""Most materials one request may name."""

WEIGHT_MAX = 1e6
"""Largest ranking weight."""

Region = Literal[REGIONS]  # type: ignore[valid-type]
Role = Literal[ROLES]  # type: ignore[valid-type]
Family = Literal[FAMILIES]  # type: ignore[valid-type]
RankKey = Literal[tuple(RANK_KEYS)]  # type: ignore[valid-type]

Ph = Annotated[float, Field(ge=PLOT.ph_min, le=PLOT.ph_max)]
Potential = Annotated[float, Field(ge=-POTENTIAL_LIMIT, le=POTENTIAL_LIMIT)]
MaterialId = Annotated[str, StringConstraints(min_length=1, max_length=64, pattern=r"^[A-Za-z][A-Za-z0-9_-]*$")]
ScaleId = Annotated[str, StringConstraints(min_length=1, max_length=32)]
Weight = Annotated[float, Field(ge=0, le=WEIGHT_MAX)]


class StrictIn(BaseModel):
    """Base of request bodies: strict types, no extra fields, finite numbers only."""

    model_config = ConfigDict(strict=True, extra="forbid", allow_inf_nan=False)


class Out(BaseModel):
    """Base of responses: the documented fields are typed; fields the engine adds later pass through unchanged,
    so the API keeps returning exactly what the CLI prints."""

    model_config = ConfigDict(extra="allow")


# --- scenarios and screening -------------------------------------------------------------

class ScenarioIn(StrictIn):
    """A screening scenario, in the shape ``electrosieve screen --json`` echoes under ``scenario``."""

    ph: Annotated[Ph | Annotated[list[Ph], Field(min_length=1, max_length=2)], POINT_OR_PAIR] = Field(
        description="pH point or [low, high] range", examples=[[0, 1]])
    potential: Annotated[Potential | Annotated[list[Potential], Field(min_length=1, max_length=2)], POINT_OR_PAIR] = Field(
        description="potential point or [low, high] range [V on `scale`]", examples=[[-0.2, 0.0]])
    scale: ScaleId = Field("SHE", description="reference scale of `potential` (see /api/v1/scales)")
    activity: Annotated[float, Field(ge=ACTIVITY_RANGE[0], le=ACTIVITY_RANGE[1])] = Field(
        DEFAULT_ACTIVITY, description="activity of every dissolved species")
    temperature: Annotated[float, Field(ge=TEMPERATURE_RANGE_C[0], le=TEMPERATURE_RANGE_C[1])] = Field(
        25.0, description="temperature [°C]")
    role: Role = "anode"
    accept: Annotated[list[Region], Field(min_length=1, max_length=3)] | None = Field(
        None, description="acceptable regions; default: immunity for a cathode, immunity and passivation for an anode")
    materials: Annotated[list[MaterialId], Field(min_length=1, max_length=MATERIALS_MAX)] | None = Field(
        None, description="material ids; omitted or null means every material")
    family: Family | None = None
    rank_by: Annotated[list[RankKey], Field(min_length=1, max_length=len(RANK_KEYS))] | None = None
    weights: Annotated[dict[RankKey, Weight], Field(max_length=len(RANK_KEYS))] | None = None

    def engine_arguments(self) -> dict:
        """Keyword arguments of ``engine.screen.make_scenario``."""
        return {"ph": self.ph, "potential": self.potential, "scale": self.scale, "activity": self.activity,
                "temperature": self.temperature, "role": self.role, "accept": self.accept,
                "materials": self.materials, "family": self.family, "rank_by": self.rank_by,
                "weights": self.weights or None}


class ScenarioEcho(Out):
    """The checked scenario as the engine echoes it."""

    ph: float | list[float]
    potential: float | list[float]
    scale: str
    activity: float
    temperature: float
    role: str
    accept: list[str]
    materials: list[str] | None
    family: str | None
    rank_by: list[str]
    weights: dict[str, float]


class Fractions(Out):
    immunity: float
    passivation: float
    corrosion: float


class StablePhase(Out):
    species: str
    region: str
    fraction: float


class Hazard(Out):
    kind: Literal["toxic", "gas"]
    species: str
    note: str


class ScreenRow(Out):
    """One ranked candidate."""

    rank: int
    material: str
    name: str
    element: str
    phase: str
    family: str
    verdict: Literal["acceptable", "partly acceptable", "rejected"]
    fractions: Fractions
    unacceptable_fraction: float
    stable_phases: list[StablePhase]
    window_dimension: int
    instability_ev: float = Field(description="eV per metal atom above the stable state, worst point of the window")
    instability_at: list[float]
    log10_dissolved: float | None = Field(description="largest equilibrium dissolved metal, log10 mol/kg")
    dissolved_at: list[float] | None
    margin_mv: float
    margin_capped: bool
    hazards: list[Hazard]
    price_usd_per_kg: float | None
    price_year: int | None
    reason: str


class OperatingWindowOut(Out):
    vertices_she: list[list[float]] = Field(description="[[pH, E vs SHE], …] counter-clockwise")
    dimension: int


class ScreenResult(Out):
    """The ranked screen: the same JSON as ``electrosieve screen --json``."""

    scenario: ScenarioEcho
    rule: str
    window: OperatingWindowOut
    catalog_version: str
    results: list[ScreenRow]
    cautions: list[str]


# --- diagrams, points, catalog ---------------------------------------------------------

class DomainOut(Out):
    formula: str
    phase: str
    region: str
    area: float
    polygon: list[list[float]]


class BoundaryOut(Out):
    species: list[str]
    equation: str
    intercept: float | None
    slope: float | None
    ph: float | None
    start: list[float]
    end: list[float]


class WaterLine(Out):
    intercept: float
    slope: float
    equation: str


class WaterOut(Out):
    hydrogen: WaterLine
    oxygen: WaterLine
    pressure_bar: float


class DiagramWindow(Out):
    ph: list[float]
    potential: list[float]
    scale: str


class DiagramOut(Out):
    """An element's exact diagram (same JSON as ``electrosieve diagram --json``)."""

    element: str
    activity: float
    temperature_c: float
    window: DiagramWindow
    domains: list[DomainOut]
    boundaries: list[BoundaryOut]
    water: WaterOut
    catalog_version: str


class PointOut(Out):
    """What is stable at one point (same JSON as ``electrosieve point --json``)."""

    formula: str
    phase: str
    region: str
    element: str
    ph: float
    potential: float
    scale: str
    potential_she: float
    activity: float
    temperature_c: float


class MaterialHazard(Out):
    species: str
    note: str


class MaterialOut(Out):
    id: str
    name: str
    element: str
    phase: str
    family: str
    price_usd_per_kg: float | None
    price_year: int | None
    price_source: str | None
    abundance_mg_per_kg: float | None
    abundance_source: str | None
    hazards: list[MaterialHazard]
    from_memory: bool
    note: str


class ScaleOut(Out):
    id: str
    name: str
    potential_vs_she: float
    ph_dependent: bool
    dE_dT: float
    valid_c: list[float]
    source: str
    citation: str
    from_memory: bool
    note: str


class SpeciesData(Out):
    formula: str
    phase: str
    region: str
    charge: int
    dgf: float
    dhf: float | None
    s: float | None
    cp: float | None
    uncertainty: float | None
    source: str
    from_memory: bool
    note: str


class SourcesOut(Out):
    """An element's species values with the citations they resolve to."""

    element: str
    species: list[SpeciesData]
    citations: dict[str, str]
    units: dict[str, str]
    catalog_version: str


class Health(Out):
    status: Literal["ok"]
    catalog_version: str
    materials: int
    elements: int
    storage: str


# --- shortlists ------------------------------------------------------------------------

def _refuse_control_characters(allowed: str):
    """A validator refusing C0 control characters (NUL included), DEL and bidirectional formatting
    characters, except the control characters in ``allowed`` (``app.textrules``)."""
    def check(text: str) -> str:
        bad = refused_characters(text, allowed)
        if bad:
            raise PydanticCustomError("control_characters",
                                      "must not contain control or text-direction characters (given {found})",
                                      {"found": ", ".join(bad)})
        return text
    return AfterValidator(check)


Title = Annotated[str, StringConstraints(strip_whitespace=True, min_length=1, max_length=TITLE_MAX),
                  _refuse_control_characters(""), WithJsonSchema({
                      "type": "string", "minLength": 1, "maxLength": TITLE_MAX, "pattern": pattern_refusing("\\u0000-\\u001f\\u007f"),
                      "description": "one line of text; control and text-direction characters are refused"})]
Note = Annotated[str, StringConstraints(max_length=NOTE_MAX), _refuse_control_characters("\t\n\r"), WithJsonSchema({
    "type": "string", "maxLength": NOTE_MAX, "pattern": pattern_refusing("\\u0000-\\u0008\\u000b\\u000c\\u000e-\\u001f\\u007f"),
    "description": "free text; tabs and line breaks allowed, other control and text-direction characters refused"})]


class ShortlistCreate(StrictIn):
    """A new shortlist: a title, the scenario to screen, and the lab lead's note per material id."""

    title: Title
    scenario: ScenarioIn
    notes: Annotated[dict[MaterialId, Note], Field(max_length=MATERIALS_MAX)] = Field(default_factory=dict)


class ShortlistCreated(Out):
    id: str
    url: str


class RankCheck(Out):
    """Today's catalog against the one the shortlist was computed with."""

    catalog_version: str
    same_version: bool
    same_order: bool | None = Field(description="null when today's catalog cannot screen the scenario any more")
    order: list[str]
    message: str


class ShortlistRow(ScreenRow):
    note: str = ""


class ShortlistLinks(Out):
    page: str
    json_twin: str
    csv: str
    start_from_this: str


class ShortlistPublic(Out):
    """A saved, read-only shortlist (the JSON twin of /s/{id})."""

    id: str
    title: str
    created_at: str
    catalog_version: str = Field(description="catalog version the ranking was computed with")
    scenario: ScenarioEcho
    rule: str
    window: OperatingWindowOut
    results: list[ShortlistRow]
    cautions: list[str]
    today: RankCheck
    links: ShortlistLinks
    citations: dict[str, str] = Field(default_factory=dict,
                                      description="sources of the prices and reference scale shown (today's catalog)")


# --- pages -----------------------------------------------------------------------------

class FieldError(Out):
    loc: list[str | int]
    msg: str
    type: str = "value_error"


class ErrorBody(Out):
    """Every 4xx body: FastAPI's shape, each entry naming its field."""

    detail: list[FieldError] | str


class Choice(Out):
    value: str
    label: str


class ScreenLinks(Out):
    page: str
    json_twin: str
    csv: str
    compare: str


class ScreenPage(Out):
    """The screen page's data: the query as understood, the form's choices, the ranked result or the errors."""

    query: dict[str, str | list[str]]
    scenario: ScenarioEcho | None
    result: ScreenResult | None
    errors: list[FieldError]
    scales: list[Choice]
    families: list[Choice]
    materials: list[Choice]
    ranking_keys: list[Choice]
    default_rank_by: list[str] = list(DEFAULT_ORDER)
    links: ScreenLinks | None
    citations: dict[str, str] = Field(description="sources of the prices, abundances and reference scale shown")
    cautions: list[str]


class CompareDiagram(Out):
    material: str
    name: str
    element: str
    row: ScreenRow | None
    diagram: DiagramOut
    figure: dict = Field(description="the Plotly figure (data and layout) drawn in the page")
    links: dict[str, str]


class ComparePage(Out):
    """Two to four candidates side by side under one scenario, the potential axis on ``axis``."""

    query: dict[str, str | list[str]]
    axis: str
    scenario: ScenarioEcho | None
    rule: str
    window: OperatingWindowOut | None
    diagrams: list[CompareDiagram]
    errors: list[FieldError]
    scales: list[Choice]
    links: dict[str, str]
    citations: dict[str, str] = Field(description="sources of every species value in the diagrams and of the scales")
    cautions: list[str]


class MaterialPage(Out):
    """One material: its diagram, boundary equations, species data with citations, hazards and cautions."""

    material: MaterialOut
    diagram: DiagramOut
    figure: dict
    sources: SourcesOut
    scales: list[Choice]
    axis: str
    links: dict[str, str]
    cautions: list[str]


class MaterialsPage(Out):
    materials: list[MaterialOut]
    catalog_version: str
    links: dict[str, str]


# --- the view state: every page's query string -------------------------------------------

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
                   "role", "accept", "pick", "family", "materials", "rank_by", "weights")
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
            rank_by="" if list(rank_by) == list(DEFAULT_ORDER) else ",".join(rank_by),
            weights=",".join(f"{k}:{_number_text(v)}" for k, v in (echo.get("weights") or {}).items()),
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
                value = float(text)
            except ValueError:
                errors.append(FieldError(loc=["query", name], msg=f"{name}: not a number (given {text!r})"))
                return None
            if not math.isfinite(value):
                errors.append(FieldError(loc=["query", name], msg=f"{name}: must be a finite number (given {text!r})"))
                return None
            return value

        ph_low, ph_high = number("ph_low"), number("ph_high", required=False)
        e_low, e_high = number("potential_low"), number("potential_high", required=False)
        temperature, activity = number("temperature"), number("activity")
        weights = None
        if self.weights:
            weights = {}
            for part in self.weights.split(","):
                key, sep, value = part.replace("=", ":").partition(":")
                try:
                    weight = float(value) if sep else math.nan
                except ValueError:
                    weight = math.nan
                if not math.isfinite(weight):
                    errors.append(FieldError(loc=["query", "weights"],
                                             msg=f"weights: write key:weight pairs such as unacceptable:1,price:0.2 (given {self.weights!r})"))
                    break
                weights[key.strip().lower()] = weight
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
        }
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
