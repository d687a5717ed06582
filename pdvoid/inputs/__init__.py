"""The inputs stage: frozen SI dataclasses of the insulation, the void, the supply and the model parameters, the
Scenario that puts them together, scenario files, materials and gases with their sources, and the demo."""
