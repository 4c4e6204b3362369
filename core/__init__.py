"""Penduline's numeric core: exact pendulum dynamics for real designs. No Qt, ever.

Public API
----------
load_design(path) -> Design        read and validate a design file (format 1)
save_design(design, path)          write it atomically
analyse(design) -> Result          every figure, curve, sensitivity and warning
DesignError                        the one error for bad input; ``.field`` names the field
Design                             the immutable design value

rating_log_from_dict / _to_dict       the rating log of DESIGN §8 (and its CSV form)
fit_rating(log, reference) -> RatingFit   per-segment rates and shared coefficients (§9)
rating_report(design, log) -> dict    the ``penduline rating --json`` object; rating_text
analyse_recording(wav, target_period_s, channel) -> BeatAnalysis   beat, asymmetry, rate from
                                      a sound recording (§9); .report_dict(), beats_text

Further: :mod:`core.solve` (target solver and sweeps), :mod:`core.fileformat` (dict and text
forms, editing by field path), :mod:`core.materials`, :mod:`core.gravity`,
:mod:`core.rating_model` (correction, fitting the model to the clock),
:mod:`core.rating_stability` (Allan deviation, Q from a decay).
"""

from .analysis import REPORT_KEYS, Result, analyse
from .beats import BEATS_REPORT_KEYS, BeatAnalysis, analyse_recording, analyse_ticks, beats_text
from .design import Design
from .errors import DesignError
from .fileformat import (
    design_from_dict,
    design_to_dict,
    dumps_design,
    load_design,
    loads_design,
    save_design,
    with_value,
)
from .rating import Conditions, RatingFit, fit_rating
from .rating_log import (
    Adjustment,
    DecayReading,
    RatingLog,
    Reading,
    rating_log_from_csv,
    rating_log_from_dict,
    rating_log_to_csv,
    rating_log_to_dict,
)
from .rating_report import rating_report, rating_text

__all__ = ["Design", "DesignError", "Result", "REPORT_KEYS", "analyse", "load_design",
           "save_design", "loads_design", "dumps_design", "design_from_dict", "design_to_dict",
           "with_value", "Conditions", "RatingFit", "fit_rating", "Adjustment", "DecayReading",
           "RatingLog", "Reading", "rating_log_from_csv", "rating_log_from_dict",
           "rating_log_to_csv", "rating_log_to_dict", "rating_report", "rating_text",
           "BeatAnalysis", "BEATS_REPORT_KEYS", "analyse_recording", "analyse_ticks",
           "beats_text"]
