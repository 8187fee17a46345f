"""Test configuration: no OpenMDAO report files during tests."""

import os

os.environ.setdefault("OPENMDAO_REPORTS", "0")
