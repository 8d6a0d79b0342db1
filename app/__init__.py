"""electrosieve's interfaces: the command line and the web service."""
