"""Errors the engine raises: each names what was wrong and what is allowed."""


class ElectrosieveError(ValueError):
    """Base of every error meant to be read by a user.

    ``field`` names the input that was wrong (a CLI option, an API field or a
    data-file field) so interfaces can point at it.
    """

    def __init__(self, message: str, *, field: str | None = None):
        super().__init__(message)
        self.message = message
        self.field = field

    def __str__(self) -> str:
        return self.message


class CatalogError(ElectrosieveError):
    """A data file that is missing, malformed or inconsistent."""


class InputError(ElectrosieveError):
    """A user's request that the engine cannot answer as given."""
