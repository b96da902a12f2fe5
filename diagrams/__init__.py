"""Diagrams: PD codes, their Jones polynomial, Wirtinger numbers, and diagram → plat."""

# plait/__init__.py reaches this package through plait.convert while ``plait`` is still
# half-initialized: modules here import plait.errors and plait.word by their full module
# paths and never take names from the top-level ``plait`` package.
from plait.diagrams.fromdiagram import DiagramPlat, check_plat, diagram_to_plat, pd_to_plat, tidy
from plait.diagrams.heights import lift, sweep_plat
from plait.diagrams.pd import (
    PDCode,
    pd_components,
    pd_orientation,
    planar_embedding,
    plat_to_pd,
    trace_plat,
    validate_pd,
)
from plait.diagrams.pdjones import pd_jones, plat_jones
from plait.diagrams.vogel import pd_to_closed_braid
from plait.diagrams.wirtinger import Wirtinger, wirtinger

__all__ = [
    "PDCode",
    "validate_pd",
    "planar_embedding",
    "pd_orientation",
    "pd_components",
    "trace_plat",
    "plat_to_pd",
    "pd_jones",
    "plat_jones",
    "Wirtinger",
    "wirtinger",
    "lift",
    "sweep_plat",
    "DiagramPlat",
    "diagram_to_plat",
    "pd_to_plat",
    "check_plat",
    "tidy",
    "pd_to_closed_braid",
]
