#!/usr/bin/env python3
"""The layer check: no module of src/ imports from a room above its own, and no files import
each other in a circle.

The rooms, bottom to top (DEVELOPERS.md draws them):

    mechanics  text  study  picture  output  window  cli

A file may name (`use crate::…`, `crate::…` in code, `super::…`) only modules of its own room
or of rooms below it. Within a room, the files' imports form no cycle (a cycle is printed with
its files). Test modules (`#[cfg(test)] mod tests { … }` at the end of a file) are not read:
a test may use whatever it checks against. `lib.rs` and `main.rs` are the roof and may name
anything.

Usage: scripts/layers.py [--stats]   (exit status 1 when a rule is broken; --stats also prints
the file count, the largest file and the import graph's size)
"""
import re
import sys
from pathlib import Path

ROOMS = ["mechanics", "text", "study", "picture", "output", "window", "cli"]
ROOF = {"lib", "main"}

SRC = Path(__file__).resolve().parent.parent / "src"


def module_of(path: Path) -> tuple:
    parts = list(path.relative_to(SRC).with_suffix("").parts)
    if parts[-1] == "mod":
        parts.pop()
    return tuple(parts)


def code_of(text: str) -> str:
    """The file without its trailing test module, comments, strings and character literals."""
    cut = re.search(r"^#\[cfg\(test\)\]\s*\n\s*mod tests\b", text, re.M)
    if cut:
        text = text[: cut.start()]
    out, i, n = [], 0, len(text)
    while i < n:
        c = text[i]
        if text.startswith("//", i):
            i = text.find("\n", i)
            i = n if i < 0 else i
        elif text.startswith("/*", i):
            j = text.find("*/", i + 2)
            i = n if j < 0 else j + 2
        elif c == "r" and re.match(r'r#*"', text[i:]) and (i == 0 or not (text[i - 1].isalnum() or text[i - 1] == "_")):
            hashes = re.match(r"r(#*)\"", text[i:]).group(1)
            j = text.find('"' + hashes, i + 2 + len(hashes))
            out.append('""')
            i = n if j < 0 else j + 1 + len(hashes)
        elif c == '"':
            j = i + 1
            while j < n and text[j] != '"':
                j += 2 if text[j] == "\\" else 1
            out.append('""')
            i = j + 1
        elif c == "'" and re.match(r"'(\\.[^']*|[^'\\])'", text[i:]):
            m = re.match(r"'(\\.[^']*|[^'\\])'", text[i:])
            out.append("' '")
            i += m.end()
        else:
            out.append(c)
            i += 1
    return "".join(out)


def use_paths(tree: str, prefix: list) -> list:
    """Expands a use tree (`a::{b, c::{d, e}}`) into paths."""
    tree = tree.strip()
    out = []
    depth, start, items = 0, 0, []
    # Split the top level on commas.
    for i, ch in enumerate(tree):
        if ch == "{":
            depth += 1
        elif ch == "}":
            depth -= 1
        elif ch == "," and depth == 0:
            items.append(tree[start:i])
            start = i + 1
    items.append(tree[start:])
    for item in items:
        item = item.strip()
        if not item:
            continue
        brace = item.find("{")
        if brace >= 0 and item.endswith("}"):
            head = [p for p in item[:brace].split("::") if p]
            out += use_paths(item[brace + 1 : -1], prefix + head)
        else:
            name = item.split(" as ")[0].strip()
            out.append(prefix + [p for p in name.split("::") if p])
    return out


def references(module: tuple, code: str) -> list:
    """Every crate path the code names, absolute."""
    paths = []
    for m in re.finditer(r"\buse\s+((?:crate|super|self)::[^;]*);", code):
        paths += use_paths(m.group(1), [])
    for m in re.finditer(r"\b((?:crate|super)(?:::\w+)+)", code):
        paths.append(m.group(1).split("::"))
    out = []
    for p in paths:
        if p[0] == "crate":
            out.append(p[1:])
        elif p[0] == "self":
            out.append(list(module) + p[1:])
        elif p[0] == "super":
            base = list(module[:-1])
            p = p[1:]
            while p and p[0] == "super":
                base = base[:-1]
                p = p[1:]
            out.append(base + p)
    return out


def main() -> int:
    files = sorted(SRC.rglob("*.rs"))
    modules = {module_of(f): f for f in files}
    graph = {}
    broken = []
    for module, path in modules.items():
        code = code_of(path.read_text())
        targets = set()
        for ref in references(module, code):
            # The longest prefix that is a module of the crate.
            for n in range(len(ref), 0, -1):
                if tuple(ref[:n]) in modules:
                    targets.add(tuple(ref[:n]))
                    break
        targets.discard(module)
        # A module names its own submodules (`pub mod x;`) and is named by them: that is
        # nesting, not an import.
        targets = {t for t in targets if t[: len(module)] != module}
        graph[module] = targets
        room = module[0] if module else "lib"
        if room in ROOF:
            continue
        if room not in ROOMS:
            broken.append(f"{path.relative_to(SRC.parent)}: in no room (rooms: {', '.join(ROOMS)})")
            continue
        for t in sorted(targets):
            if t[0] in ROOF:
                continue
            if t[0] not in ROOMS or ROOMS.index(t[0]) > ROOMS.index(room):
                broken.append(
                    f"{path.relative_to(SRC.parent)}: imports {'::'.join(t)} "
                    f"from the room above ({t[0]} over {room})"
                )
    # Cycles: strongly connected components of the file graph (Tarjan).
    index, low, stack, on, sccs = {}, {}, [], set(), []
    counter = [0]

    def visit(v):
        index[v] = low[v] = counter[0]
        counter[0] += 1
        stack.append(v)
        on.add(v)
        for w in graph.get(v, ()):
            if w not in graph:
                continue
            if w not in index:
                visit(w)
                low[v] = min(low[v], low[w])
            elif w in on:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            comp = []
            while True:
                w = stack.pop()
                on.discard(w)
                comp.append(w)
                if w == v:
                    break
            if len(comp) > 1:
                sccs.append(sorted(comp))

    sys.setrecursionlimit(10000)
    for v in graph:
        if v not in index:
            visit(v)
    for comp in sccs:
        if any(c and c[0] in ROOF for c in comp):
            continue
        broken.append("cycle: " + " ↔ ".join("::".join(c) for c in comp))
    if "--stats" in sys.argv:
        sizes = sorted(((len(f.read_text().splitlines()), f) for f in files), reverse=True)
        print(f"{len(files)} files; largest {sizes[0][1].relative_to(SRC.parent)} ({sizes[0][0]} lines)")
        print(f"{sum(len(t) for t in graph.values())} file-to-file imports; {len(sccs)} cycles")
    for line in broken:
        print(line)
    if broken:
        print(f"layers: {len(broken)} broken rule(s)", file=sys.stderr)
        return 1
    print("layers: every import runs downward, no cycles")
    return 0


if __name__ == "__main__":
    sys.exit(main())
