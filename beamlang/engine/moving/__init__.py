"""Moving loads: a solved member and a target with a travelling force group -> its exact envelope.

kernels (influence kernels from unit-force solutions) -> cells (the group's geometry on the (x, p) plane)
-> search (edges, corners and interiors of every cell, pruned by the float bounds) -> Envelope."""

from beamlang.engine.moving.cells import directions, group_offsets
from beamlang.engine.moving.found import Critical, Envelope
from beamlang.engine.moving.kernels import QUANTITIES, kernels_for
from beamlang.engine.moving.search import envelope, scaled, standing_case, standing_loads

__all__ = ["QUANTITIES", "Critical", "Envelope", "directions", "envelope", "group_offsets", "kernels_for", "scaled",
           "standing_case", "standing_loads"]
