"""Request and response schemas of the web app, in layers per resource: the complete public contract.

Requests are strict: unknown fields, wrong types, booleans for numbers, NaN and
infinities are refused with a 422 naming the field. Bounds come from the engine
(``engine.inputs``, ``engine.domains.PlotLimits``) so the API and the engine agree;
the engine still makes the final checks (e.g. a potential window that leaves the
diagram once converted to the SHE) and its errors name their field too.

Responses declare every field they carry and allow no other (``Out``), so ``/openapi.json``
documents every key; their values come from ``app.payloads``, the same JSON the CLI prints.
Query strings are parsed in ``app.viewstate``.
"""

from typing import Annotated, Literal

from pydantic import AfterValidator, BaseModel, ConfigDict, Field, StringConstraints, WithJsonSchema
from pydantic_core import PydanticCustomError

from electrosieve.engine.inputs import ACTIVITY_RANGE, DEFAULT_ACTIVITY, LIGAND_ACTIVITY_RANGE, TEMPERATURE_RANGE_C
from electrosieve.engine.conduction import CONDUCTIONS
from electrosieve.engine.notes import KINDS
from electrosieve.engine.kinetics import CURRENT_DENSITY_RANGE, DEFAULT_CURRENT_DENSITY
from electrosieve.engine.domains import PlotLimits
from electrosieve.engine.materials import FAMILIES
from electrosieve.engine.ranking import DEFAULT_ORDER, RANK_KEYS
from electrosieve.engine.screen import REGIONS, ROLES

from .storage import NOTE_MAX, TITLE_MAX
from .shapes import POINT_OR_PAIR
from .textrules import pattern_refusing, refused_characters

PLOT = PlotLimits()
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
Recipe = Annotated[str, StringConstraints(min_length=1, max_length=200)]
IonName = Annotated[str, StringConstraints(min_length=1, max_length=32)]
IonActivity = Annotated[float, Field(ge=ACTIVITY_RANGE[0], le=ACTIVITY_RANGE[1])]
Chloride = Annotated[float, Field(ge=LIGAND_ACTIVITY_RANGE[0], le=LIGAND_ACTIVITY_RANGE[1])]
IONS_MAX = 20
"""Most ions one request may name."""


class StrictIn(BaseModel):
    """Base of request bodies: strict types, no extra fields, finite numbers only."""

    model_config = ConfigDict(strict=True, extra="forbid", allow_inf_nan=False)


class Out(BaseModel):
    """Base of responses: every field declared and typed, no other allowed (a new result field is added here
    and in ``app.payloads`` together, or the response fails loudly in the tests)."""

    model_config = ConfigDict(extra="forbid")


# --- scenarios and screening -------------------------------------------------------------

class ScenarioIn(StrictIn):
    """A screening scenario, in the shape ``electrosieve screen --json`` echoes under ``scenario``."""

    ph: Annotated[Ph | Annotated[list[Ph], Field(min_length=1, max_length=2)] | None, POINT_OR_PAIR] = Field(
        None, description="pH point or [low, high] range; omitted: the `electrolyte` recipe's pH", examples=[[0, 1]])
    potential: Annotated[Potential | Annotated[list[Potential], Field(min_length=1, max_length=2)], POINT_OR_PAIR] = Field(
        description="potential point or [low, high] range [V on `scale`]", examples=[[-0.2, 0.0]])
    scale: ScaleId = Field("SHE", description="reference scale of `potential` (see /api/v1/scales)")
    activity: Annotated[float, Field(ge=ACTIVITY_RANGE[0], le=ACTIVITY_RANGE[1])] = Field(
        DEFAULT_ACTIVITY, description="activity of every dissolved species")
    temperature: Annotated[float, Field(ge=TEMPERATURE_RANGE_C[0], le=TEMPERATURE_RANGE_C[1])] = Field(
        25.0, description="temperature [°C]")
    role: Role = Field("anode", description="electrode role (see /docs): " + ", ".join(ROLES))
    accept: Annotated[list[Region], Field(min_length=1, max_length=len(REGIONS))] | None = Field(
        None, description="acceptable regions; default: the role's own (e.g. immunity for a cathode)")
    materials: Annotated[list[MaterialId], Field(min_length=1, max_length=MATERIALS_MAX)] | None = Field(
        None, description="material ids; omitted or null means every material")
    family: Family | None = None
    rank_by: Annotated[list[RankKey], Field(max_length=len(RANK_KEYS))] | None = Field(
        None, description="a ranking order of your own; omitted, null or empty means the role's own rule")
    weights: Annotated[dict[RankKey, Weight], Field(max_length=len(RANK_KEYS))] | None = None
    electrolyte: Recipe | None = Field(None, description="electrolyte recipe, e.g. '0.6 M NaCl', '30 wt% KOH', "
                                       "'seawater' (grammar: `electrosieve electrolyte`)", examples=["seawater"])
    ion_activities: Annotated[dict[IonName, IonActivity], Field(max_length=IONS_MAX)] | None = Field(
        None, description="activity of named dissolved species, overriding `activity` and the recipe for those "
        "only", examples=[{"Cu^2+": 0.1}])
    chloride: Chloride | None = Field(None, description="free chloride activity (overrides the recipe's)")
    current_density: Annotated[float, Field(ge=CURRENT_DENSITY_RANGE[0], le=CURRENT_DENSITY_RANGE[1])] = Field(
        DEFAULT_CURRENT_DENSITY, description="current density at which kinetic onsets are read [mA cm^-2]")

    def engine_arguments(self) -> dict:
        """Keyword arguments of ``engine.screen.make_scenario``."""
        return {"ph": self.ph, "potential": self.potential, "scale": self.scale, "activity": self.activity,
                "temperature": self.temperature, "role": self.role, "accept": self.accept,
                "materials": self.materials, "family": self.family, "rank_by": self.rank_by or None,
                "weights": self.weights or None, "electrolyte": self.electrolyte,
                "ion_activities": self.ion_activities, "chloride": self.chloride,
                "current_density": self.current_density}


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
    rank_by: list[str] = Field(description="the ranking order chosen; empty for the role's own rule")
    weights: dict[str, float]
    electrolyte: str | None = None
    ion_activities: dict[str, float] | None = None
    chloride: float | None = None
    current_density: float = Field(DEFAULT_CURRENT_DENSITY, description="[mA cm^-2] of the kinetic onsets")


class Fractions(Out):
    immunity: float
    passivation: float
    hydride: float
    corrosion: float


class StablePhase(Out):
    species: str
    region: str
    fraction: float


class Hazard(Out):
    kind: Literal["toxic", "gas"]
    species: str
    note: str


class SurfaceOut(Out):
    phase: str
    conduction: Literal[CONDUCTIONS]  # type: ignore[valid-type]
    source: str = Field(description="a key of /api/v1/sources or 'common practice'")


class KineticsOut(Out):
    current_density_ma_cm2: float
    hydrogen_onset_v_rhe: float | None = Field(description="hydrogen evolution onset [V vs RHE]; null without data")
    oxygen_onset_v_rhe: float | None = Field(description="oxygen evolution onset [V vs RHE]; null without data")
    sources: list[str]


class RobustnessOut(Out):
    verdict_probability: float = Field(ge=0, le=1)
    draws: int


class NoteOut(Out):
    kind: Literal[KINDS]  # type: ignore[valid-type]
    text: str
    source: str


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
    caution: str | None = Field(None, description="pitting in chloride, in plain words, where the window meets a "
                                "passive region")
    surface: SurfaceOut | None = Field(None, description="the least conducting surface the window meets; null where unknown")
    kinetics: KineticsOut | None = Field(None, description="the material's own water window; null where unknown")
    robustness: RobustnessOut | None = Field(None, description="how often the verdict holds within the data's uncertainties")
    notes: list[NoteOut] = Field([], description="where thermodynamics alone misleads")
    order_robust: bool | None = Field(
        None, description="false when this row's place above the next could swap within the data's uncertainties")
    dissolved: str | None = Field(None, description="the dissolved metal in words ('dissolves freely (> 1 M)', 'unknown (…)')")


class OperatingWindowOut(Out):
    vertices_she: list[list[float]] = Field(description="[[pH, E vs SHE], …] counter-clockwise")
    dimension: int


class ScreenResult(Out):
    """The ranked screen: the same JSON as ``electrosieve screen --json``."""

    scenario: ScenarioEcho
    rule: str
    window: OperatingWindowOut
    catalog_version: str
    conditions: str = Field(description="the assumptions behind the result, in words")
    neutral_ph: float = Field(description="pH of neutral water at the scenario's temperature")
    temperature_notes: dict[str, list[str]] = Field(
        description="per element, the approximations its species' ΔfG(T) used; empty at 25 °C")
    results: list[ScreenRow]
    cautions: list[str]
    warnings: list[str] = Field([], description="doubtful conditions in plain words (pH beyond what water allows, "
                                "the activity model's range, pitting in chloride)")
    electrolyte: "ElectrolyteOut | None" = Field(None, description="the recipe's pH, ionic strength and activities")


# --- diagrams, points, catalog ---------------------------------------------------------

class ElectrolyteOut(Out):
    """A recipe at a temperature (same JSON as ``electrosieve electrolyte --json``)."""

    recipe: str
    temperature_c: float
    ph: float = Field(description="-log10 a(H+) at the temperature")
    ionic_strength: float = Field(description="ionic strength [mol/kg]")
    activities: dict[str, float] = Field(description="free-ion activities, H+ and OH- first")
    molalities: dict[str, float] = Field(description="free-ion molalities [mol/kg]")
    water_activity: float
    model: str = Field(description="the activity model used")
    validity: str = Field(description="the model's range")
    warnings: list[str]
    sources: list[str] = Field(description="keys of the bibliography")
    cautions: list[str]


class SolutionOut(Out):
    """The dissolved conditions a diagram or point was computed for."""

    electrolyte: ElectrolyteOut | None = None
    ion_activities: dict[str, float] = Field({}, description="activity of named dissolved species")
    chloride: float | None = Field(None, description="free chloride activity")
    warnings: list[str] = Field([], description="doubtful conditions in plain words")


ScreenResult.model_rebuild()


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
    neutral_ph: float = Field(description="pH of neutral water at the diagram's temperature")


class DiagramLimits(Out):
    """The diagram's plot limits: pH and potential ranges."""

    ph: list[float]
    potential: list[float]
    scale: str


class DiagramOut(SolutionOut):
    """An element's exact diagram (same JSON as ``electrosieve diagram --json``)."""

    element: str
    activity: float
    temperature_c: float
    limits: DiagramLimits
    domains: list[DomainOut]
    boundaries: list[BoundaryOut]
    water: WaterOut
    conditions: str = Field(description="the assumptions behind the diagram, in words")
    temperature_notes: list[str] = Field(description="the approximations the species' ΔfG(T) used; empty at 25 °C")
    catalog_version: str
    ligand_activities: dict[str, float] = Field({}, description="free-ligand activities whose complexes and salts "
                                                "the diagram holds")


class PointOut(SolutionOut):
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


class RankChange(Out):
    """One candidate whose rank or verdict differs today (``app.rankdiff.ranking_changes``)."""

    material: str
    name: str
    rank_before: int | None = Field(description="rank when saved; null when it was not ranked then")
    rank_now: int | None = Field(description="rank today; null when today's catalog no longer ranks it")
    moved: int | None = Field(description="places moved up (positive) or down (negative); null when on one side only")
    verdict_before: str | None
    verdict_now: str | None
    reason: str = Field(description="today's one-line reason")


class RankCheck(Out):
    """Today's catalog against the one the shortlist was computed with."""

    catalog_version: str
    same_version: bool
    same_order: bool | None = Field(description="null when today's catalog cannot screen the scenario any more")
    order: list[str]
    message: str
    changes: list[RankChange] = Field(default=[], description="the candidates that moved or changed verdict today")


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


class RoleChoice(Out):
    value: str
    label: str
    description: str
    rule: str


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
    roles: list[RoleChoice] = Field([], description="the electrode roles, each with what it checks and its rule")


class CompareDiagram(Out):
    material: str
    name: str
    element: str
    row: ScreenRow | None
    diagram: DiagramOut
    figure: dict = Field(description="the Plotly figure (data and layout) drawn in the page")
    links: dict[str, str]


class ComparePage(Out):
    """One to six candidates side by side under one scenario, the potential axis on ``axis``."""

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


class OnsetLine(Out):
    material: str
    gas: Literal["hydrogen", "oxygen"]
    medium: str
    ph: list[float] = Field(description="[low, high] pH band of the medium the data were measured in")
    v_rhe: float = Field(description="onset [V vs RHE] at the current density (Tafel equation)")
    current_density_ma_cm2: float
    sources: list[str]


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
    unchecked: list[str] = Field(description="species of the element whose values no independent published check covers")
    onsets: list[OnsetLine] = Field([], description="the material's own hydrogen and oxygen onsets drawn on its diagram")


class MaterialsPage(Out):
    materials: list[MaterialOut]
    catalog_version: str
    links: dict[str, str]
