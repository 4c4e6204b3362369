"""Penduline's numeric core: exact pendulum dynamics for real designs. No Qt, ever.

Public API
----------
load_design(path) -> Design        read and validate a design file (format 1)
save_design(design, path)          write it atomically
analyse(design) -> Result          every figure, curve, sensitivity and warning
DesignError                        the one error for bad input; ``.field`` names the field
Design                             the immutable design value

Further: :mod:`core.solve` (target solver and sweeps), :mod:`core.fileformat` (dict and text
forms, editing by field path), :mod:`core.materials`, :mod:`core.gravity`.
"""

from .analysis import REPORT_KEYS, Result, analyse
from .design import Design
from .errors import DesignError
from .fileformat import (design_from_dict, design_to_dict, dumps_design, load_design,
                         loads_design, save_design, with_value)

__all__ = ["Design", "DesignError", "Result", "REPORT_KEYS", "analyse", "load_design",
           "save_design", "loads_design", "dumps_design", "design_from_dict", "design_to_dict",
           "with_value"]

# beat recordings (DESIGN §9): analyse_recording(path, target_period_s, channel) -> BeatAnalysis
from .beats import BEATS_REPORT_KEYS, BeatAnalysis, analyse_recording, analyse_ticks, beats_text  # noqa: E402

__all__ += ["BeatAnalysis", "BEATS_REPORT_KEYS", "analyse_recording", "analyse_ticks",
            "beats_text"]
