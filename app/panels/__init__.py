"""Input panels of the main window: Site & fluid, Pipework, Pumps, Criteria."""
