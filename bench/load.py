"""The load client of the service bench, run in its own process: an interleaved mix of requests from
``clients`` asyncio tasks sharing one ``httpx.AsyncClient`` (keep-alive, gzip accepted, as a browser).

``python bench/load.py PORT CLIENTS REQUESTS SEED`` prints one JSON object: per request kind, the latencies'
p50 and p99 [ms], the count and the errors (any status but 200, or no answer).
"""

import asyncio
import json
import random
import statistics
import sys
import time

import httpx

SCENARIO = {"ph": [13, 14], "potential": [1.5, 1.7], "scale": "RHE", "role": "anode"}
QUERY = "ph_low=0&ph_high=1&potential_low=-0.2&potential_high=0&scale=SHE&role=cathode"
COMPARE = "/compare?" + QUERY + "&compare=Pt&compare=Zn&compare=Cu&compare=Ni"
SCALES = ("SHE", "RHE", "SCE", "AgAgCl-3M")
MIX = {"healthz": 3, "screen": 2, "screen_fresh": 3, "page_screen": 1, "compare": 1, "material": 1,
       "screen_json": 1, "material_json": 1, "compare_json": 1}
"""Relative weight of each request kind in the mix."""


def fresh_scenario(rng: random.Random) -> dict:
    """A scenario never asked before: random pH and potential ranges, scale, temperature 5–95 °C and activity."""
    ph = sorted(round(rng.uniform(0, 14), 4) for _ in range(2))
    low = round(rng.uniform(-1.0, 1.0), 4)
    return {"ph": ph, "potential": [low, round(low + rng.uniform(0.05, 0.8), 4)], "scale": rng.choice(SCALES[:2]),
            "temperature": round(rng.uniform(5, 95), 3), "activity": 10 ** round(rng.uniform(-8, -1), 3),
            "role": rng.choice(("anode", "cathode"))}


async def send(client: httpx.AsyncClient, kind: str, rng: random.Random) -> int:
    if kind == "healthz":
        response = await client.get("/healthz")
    elif kind in ("screen", "screen_fresh"):
        body = SCENARIO if kind == "screen" else fresh_scenario(rng)
        response = await client.post("/api/v1/screen", json=body)
    elif kind == "page_screen":
        response = await client.get("/")
    elif kind == "screen_json":
        response = await client.get("/screen.json?" + QUERY)
    elif kind in ("compare", "compare_json"):
        response = await client.get(COMPARE.replace("/compare?", "/compare.json?") if kind == "compare_json" else COMPARE)
    else:
        response = await client.get("/materials/Fe" + (".json" if kind == "material_json" else ""))
    return response.status_code


async def run(port: int, clients: int, requests: int, seed: int) -> dict:
    rng = random.Random(seed)
    kinds = [kind for kind, weight in MIX.items() for _ in range(weight)]
    plan = [rng.choice(kinds) for _ in range(requests)]
    queue: asyncio.Queue = asyncio.Queue()
    for kind in plan:
        queue.put_nowait(kind)
    results: dict[str, list] = {kind: [] for kind in MIX}
    errors: dict[str, list] = {kind: [] for kind in MIX}
    limits = httpx.Limits(max_connections=clients, max_keepalive_connections=clients)
    async with httpx.AsyncClient(base_url=f"http://127.0.0.1:{port}", limits=limits, timeout=60,
                                 headers={"accept-encoding": "gzip"}) as client:

        async def worker():
            while not queue.empty():
                kind = queue.get_nowait()
                start = time.perf_counter()
                try:
                    status = await send(client, kind, rng)
                except httpx.HTTPError as error:
                    status = type(error).__name__
                results[kind].append((time.perf_counter() - start) * 1000)
                if status != 200:
                    errors[kind].append(status)

        start = time.perf_counter()
        await asyncio.gather(*(worker() for _ in range(clients)))
        wall = time.perf_counter() - start
    figures = {"clients": clients, "requests": requests, "requests_per_s": round(requests / wall, 1)}
    for kind, times in results.items():
        times.sort()
        if times:
            figures[kind] = {"n": len(times), "p50_ms": round(statistics.median(times), 2),
                             "p99_ms": round(times[min(len(times) - 1, int(0.99 * len(times)))], 2),
                             "errors": len(errors[kind]), **({"error_kinds": sorted(set(map(str, errors[kind])))}
                                                              if errors[kind] else {})}
    return figures


if __name__ == "__main__":
    port, clients, requests, seed = (int(a) for a in sys.argv[1:5])
    print(json.dumps(asyncio.run(run(port, clients, requests, seed))))
