"""Editor server timings -> a table: start to `initialize` answered, and a change to its diagnostics, per example.

    python tests/benchmarks/bench_lsp.py [ROUNDS]

Median of ROUNDS (default 5) on this machine; nothing is asserted."""

from __future__ import annotations

import asyncio
import statistics
import sys
import time
from pathlib import Path

from lsprotocol import types
from pygls.lsp.client import LanguageClient

EXAMPLES = Path(__file__).resolve().parents[2] / "examples"


async def _one_round(files: list[Path]) -> tuple[float, dict[str, float]]:
    client = LanguageClient("bench", "1")
    arrived: asyncio.Queue = asyncio.Queue()

    @client.feature(types.TEXT_DOCUMENT_PUBLISH_DIAGNOSTICS)
    def published(params: types.PublishDiagnosticsParams) -> None:
        arrived.put_nowait(time.perf_counter())

    start = time.perf_counter()
    await client.start_io(sys.executable, "-m", "beamlang", "lsp")
    await client.initialize_async(types.InitializeParams(capabilities=types.ClientCapabilities()))
    ready = time.perf_counter() - start
    client.initialized(types.InitializedParams())
    changes = {}
    for path in files:
        uri, text = path.as_uri(), path.read_text(encoding="utf-8")
        client.text_document_did_open(types.DidOpenTextDocumentParams(
            text_document=types.TextDocumentItem(uri=uri, language_id="beam", version=0, text=text)))
        await arrived.get()
        sent = time.perf_counter()
        client.text_document_did_change(types.DidChangeTextDocumentParams(
            text_document=types.VersionedTextDocumentIdentifier(uri=uri, version=1),
            content_changes=[types.TextDocumentContentChangeWholeDocument(text=text + "\n")]))
        changes[path.name] = await arrived.get() - sent
    await client.shutdown_async(None)
    client.exit(None)
    await client.stop()
    return ready, changes


def main(rounds: int) -> None:
    files = sorted(EXAMPLES.glob("*.beam"))
    results = [asyncio.run(_one_round(files)) for _ in range(rounds)]
    print(f"median of {rounds} rounds")
    print(f"{'start to initialize answered':<48} {statistics.median(r[0] for r in results) * 1000:8.0f} ms")
    for path in files:
        change = statistics.median(r[1][path.name] for r in results)
        print(f"{'change -> diagnostics, ' + path.name:<48} {change * 1000:8.1f} ms")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 5)
