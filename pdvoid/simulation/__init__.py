"""The simulation stage: ``simulate`` runs a scenario through its model and kernel; ``Result`` holds the events
with the scenario, seed and run settings; ``Events`` is the container every analysis accepts."""
