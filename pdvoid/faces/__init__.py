"""The faces: the command line, plots, the design-review pack and the notebook workbench. Display units live here
and nowhere below."""
