"""electrosieve's thermodynamics engine: exact E–pH stability domains and screening (pure numpy, no I/O after loading).

The public interface is its modules (one idea each) and the typed values and errors below; functions are
reached through their module (``engine.diagram.diagram``, ``engine.screen.screen``), so a module's name is
never shadowed by a function of the same name.
"""

from . import (catalog, constants, diagram, domains, errors, formula, geometry, inputs, kw, materials, metrics, planes,
               ranking, scales, screen, species, thermo, water, window)
from . import activity, chloride, electrolyte, solution
from .catalog import Catalog
from .diagram import Diagram
from .domains import Boundary, Domain, PlotLimits
from .errors import CatalogError, ElectrosieveError, InputError
from .screen import ElementVerdict, Scenario
from .window import OperatingWindow
from .electrolyte import Electrolyte
from .solution import Solution

__all__ = [
    # modules
    "catalog", "constants", "diagram", "domains", "errors", "formula", "geometry", "inputs", "kw", "materials",
    "metrics", "planes", "ranking", "scales", "screen", "species", "thermo", "water", "window",
    # typed values and errors
    "Boundary", "Catalog", "CatalogError", "Diagram", "Domain", "ElectrosieveError", "ElementVerdict", "InputError",
    "OperatingWindow", "PlotLimits", "Scenario",
    # the electrolyte (issue 15)
    "activity", "chloride", "electrolyte", "solution", "Electrolyte", "Solution",
]
