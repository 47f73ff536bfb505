"""Result panels of the window: the checks list and the operating-points table."""
