"""The one place where the homotopy width code imports the homotopy height code.

Everything the width solvers reuse from the height solvers comes through
this module, so that a reorganisation of :mod:`sweepwidth.solve` needs
changes here only.
"""

from __future__ import annotations

from ..homotopy import bfs_rank, construct_homotopy, homotopy_height
from ..homotopy.free_group import FreeGroup
from ..homotopy.walks import WalkSpace

__all__ = ["FreeGroup", "WalkSpace", "bfs_rank", "construct_homotopy", "homotopy_height"]
