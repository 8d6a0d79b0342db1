"""The built-in catalog data (installed as the package ``electrosieve.data``)."""
