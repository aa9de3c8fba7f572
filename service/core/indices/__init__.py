"""Material indices, combined with the shape factors a material can reach in a section family.

One idea per module:

- :mod:`~service.core.indices.derivation`: each loading x limit pair's governing relation and
  the index derived from it (and custom power-law indices);
- :mod:`~service.core.indices.shape_limits`: the largest shape factor each material reaches
  in a family before its walls buckle locally (the search of :mod:`service.core.search`);
- :mod:`~service.core.indices.ranking`: every material in every family, best first;
- :mod:`~service.core.indices.chart`: the data of a log-log chart of a ranking.
"""

from service.core.indices.chart import Chart, ChartAxis, ChartPoint
from service.core.indices.derivation import (
    LIMITS,
    LOADINGS,
    MAX_CUSTOM_EXPONENT,
    OBJECTIVES,
    RELATIONS,
    GoverningRelation,
    IndexDefinition,
    custom_index,
    derive,
    exponent_errors,
    material_index,
)
from service.core.indices.ranking import (
    Exclusion,
    RankedResult,
    Ranking,
    RankingRequest,
    proportion_errors,
    rank,
    ranked_families,
    validate_ranking,
)
from service.core.indices.shape_limits import ShapeLimit, ranks_in_rankings, shape_limits

__all__ = [
    "LIMITS",
    "LOADINGS",
    "MAX_CUSTOM_EXPONENT",
    "OBJECTIVES",
    "RELATIONS",
    "Chart",
    "ChartAxis",
    "ChartPoint",
    "Exclusion",
    "GoverningRelation",
    "IndexDefinition",
    "RankedResult",
    "Ranking",
    "RankingRequest",
    "ShapeLimit",
    "custom_index",
    "derive",
    "exponent_errors",
    "material_index",
    "proportion_errors",
    "rank",
    "ranked_families",
    "ranks_in_rankings",
    "shape_limits",
    "validate_ranking",
]
