import sys
from pathlib import Path

# The tests import their helpers as ``support.*``.
sys.path.insert(0, str(Path(__file__).parent))
