"""Run every benchmark and print one JSON object of figures (``make bench``)."""

import json
import platform
import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from engine_bench import engine_figures  # noqa: E402
from robustness_bench import robustness_figures  # noqa: E402
from memory import memory_figures  # noqa: E402
from service_bench import service_figures  # noqa: E402
from temperature import temperature_figures  # noqa: E402
from web_bench import web_figures  # noqa: E402


def machine() -> dict:
    import os

    return {"python": platform.python_version(), "machine": platform.machine(), "cpus": os.cpu_count()}


def main() -> None:
    figures = {"machine": machine(), "engine": engine_figures(), "robustness": robustness_figures(),
               "temperature": temperature_figures(),
               "web": web_figures(), "service": service_figures(), "memory": memory_figures()}
    print(json.dumps(figures, indent=2))


if __name__ == "__main__":
    main()
