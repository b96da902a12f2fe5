"""Pictures: plat drawings as hand-written SVG, and the summary plot of a batch."""

from plait.pictures.batch import batch_summary, batch_summary_svg, read_results
from plait.pictures.draw import CONVENTION, draw_compare, draw_plat, plat_svg
from plait.pictures.runfolder import RunFolder, read_run_folder
from plait.pictures.svg import Drawing, Node, Style, component_colors, save_drawing

__all__ = [
    "draw_plat",
    "draw_compare",
    "plat_svg",
    "save_drawing",
    "read_run_folder",
    "RunFolder",
    "batch_summary",
    "batch_summary_svg",
    "read_results",
    "Drawing",
    "Node",
    "Style",
    "component_colors",
    "CONVENTION",
]
