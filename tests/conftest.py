"""Test-suite settings.

Under CI (``CI`` set in the environment) hypothesis runs derandomized: the
same examples on every run, so a submission's result does not depend on the
draw.  Local runs keep exploring new examples (and their example database),
which is where new counterexamples are found; each one found becomes an
``@example`` regression.
"""

import os

from hypothesis import settings

settings.register_profile("ci", derandomize=True, print_blob=True)
if os.environ.get("CI"):
    settings.load_profile("ci")
