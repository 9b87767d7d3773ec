"""Each parameter as data: the graph, the start/end conditions, the cost of a state."""

from .ordering import OrderingProblem

__all__ = ["OrderingProblem"]
