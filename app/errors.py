"""Errors the app answers with: a 422 listing FieldErrors (each naming its field) and a 404."""

from fastapi import HTTPException

from electrosieve.engine.errors import ElectrosieveError

from .models import FieldError

class Unprocessable(HTTPException):
    """A 422 whose detail lists FieldErrors (the same shape FastAPI uses for validation errors)."""

    def __init__(self, errors: list[FieldError]):
        super().__init__(status_code=422, detail=[e.model_dump() for e in errors])
        self.errors = errors


def engine_error(error: ElectrosieveError, where: str | list, rename: dict | None = None) -> FieldError:
    """An engine error as a FieldError located at ``where`` (``"body"``, ``"query"``, ``"path"``, or a list
    such as ``["body", "scenario"]``), its field renamed by ``rename`` when the interface calls it otherwise."""
    field = error.field or "input"
    field = (rename or {}).get(field, field)
    prefix = [where] if isinstance(where, str) else list(where)
    dotted = ".".join([*prefix[1:], field])
    message = error.message if error.message.startswith(field) else f"{dotted}: {error.message}"
    return FieldError(loc=[*prefix, field], msg=message)


def not_found(what: str) -> HTTPException:
    return HTTPException(status_code=404, detail=[{"loc": ["path"], "msg": what, "type": "not_found"}])
