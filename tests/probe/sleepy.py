"""Test fixture: a step program that never finishes in time."""
import time

time.sleep(60)
