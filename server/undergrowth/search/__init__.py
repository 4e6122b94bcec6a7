"""The branch-and-bound engine: pure numerics (numpy, scipy, highspy).

It never imports FastAPI, pydantic or asyncio; a test checks that.
"""

from .engine import NonConvexObjectiveError, Search
from .result import STATUSES, SearchResult, relative_gap
from .settings import BRANCHING_RULES, NODE_ORDERS, SearchSettings, settings_table

__all__ = ["BRANCHING_RULES", "NODE_ORDERS", "STATUSES", "NonConvexObjectiveError", "Search",
           "SearchResult", "SearchSettings", "relative_gap", "settings_table"]
