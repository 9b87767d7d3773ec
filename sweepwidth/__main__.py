"""``python -m sweepwidth``: the command line (see :mod:`sweepwidth.cli`)."""

from .cli import main

raise SystemExit(main())
