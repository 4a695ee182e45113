"""Test fixture: a step program that fails, as a user's might when a file it
needs is missing: a message on stderr and exit code 3."""
import sys

sys.stderr.write("loading mesh...\n")
sys.stderr.write("error: bathymetry file 'kestrel-bank.nc' not found\n")
sys.exit(3)
