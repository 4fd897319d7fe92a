"""Data shipped with Ditchwright (lining catalogue, demo project, icons), found with importlib.resources."""
