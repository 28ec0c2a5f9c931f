"""Run the Python module's tests; print one line "LABEL: N passed, M
failed" (LABEL from the first argument, default "python") for make
check, and exit non-zero on any failure."""
import os
import sys
import unittest

label = sys.argv[1] if len(sys.argv) > 1 else "python"
here = os.path.dirname(os.path.abspath(__file__))
suite = unittest.defaultTestLoader.discover(here, pattern="test_*.py")
result = unittest.TextTestRunner(stream=sys.stdout, verbosity=1).run(suite)
failed = len(result.failures) + len(result.errors)
print("%s: %d passed, %d failed" % (label, result.testsRun - failed, failed))
sys.exit(1 if failed else 0)
