"""Static files of the web pages (installed as the package ``electrosieve.static``)."""
