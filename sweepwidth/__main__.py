"""``python -m sweepwidth``: the command line (see :mod:`sweepwidth.cli`)."""

from .cli import main

if __name__ == "__main__":
    raise SystemExit(main())
