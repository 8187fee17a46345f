"""The package layout: one-way imports between the task sub-packages of voltwake/, no cycle."""

import ast
from pathlib import Path

import voltwake

PACKAGE = Path(voltwake.__file__).resolve().parent

#: The task layers, lowest first: a module may import its own layer and the ones before it.
LAYERS = ['errors', 'configuration', 'design', 'outputs', 'studies', 'cli']


def _module_name(path):
    parts = path.relative_to(PACKAGE).with_suffix('').parts
    return '.'.join(p for p in parts if p != '__init__')


def _imports(path):
    """Every voltwake module imported by ``path``, at module level or inside functions."""
    name = _module_name(path)
    package = name.split('.')[:-1] if path.name != '__init__.py' else name.split('.')
    out = set()
    for node in ast.walk(ast.parse(path.read_text())):
        if isinstance(node, ast.ImportFrom):
            if node.level:
                base = package[: len(package) - (node.level - 1)] if node.level > 1 else package
                module = '.'.join(base + ([node.module] if node.module else []))
            elif node.module and node.module.startswith('voltwake.'):
                module = node.module[len('voltwake.') :]
            else:
                continue
            for alias in node.names:  # 'from . import plots' names a module
                candidate = f'{module}.{alias.name}' if module else alias.name
                out.add(candidate if _exists(candidate) else module)
        elif isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name.startswith('voltwake.'):
                    out.add(alias.name[len('voltwake.') :])
    return {m for m in out if m and _exists(m) and m != name}


def _exists(module):
    path = PACKAGE.joinpath(*module.split('.'))
    return path.with_suffix('.py').is_file() or (path / '__init__.py').is_file()


def _graph():
    graph = {}
    for path in PACKAGE.rglob('*.py'):
        if path.name == '__init__.py' and path.parent == PACKAGE:
            continue  # the public API re-exports from every layer
        graph[_module_name(path)] = _imports(path)
    return graph


def _layer(module):
    head = module.split('.')[0]
    return LAYERS.index(head) if head in LAYERS else None


def test_the_task_layers_import_one_way():
    wrong = []
    for module, imports in _graph().items():
        here = _layer(module)
        if here is None:
            continue
        for other in imports:
            there = _layer(other)
            if there is not None and there > here:
                wrong.append(f'{module} imports {other}')
    assert not wrong, wrong


def test_no_import_cycle_inside_voltwake():
    graph = _graph()
    state = {}

    def visit(node, trail):
        state[node] = 'open'
        for nxt in graph.get(node, ()):
            if state.get(nxt) == 'open':
                raise AssertionError(' -> '.join(trail + [node, nxt]))
            if nxt not in state:
                visit(nxt, trail + [node])
        state[node] = 'done'

    for node in graph:
        if node not in state:
            visit(node, [])
    assert len(graph) > 15  # the walk saw the sub-packages


def test_every_layer_has_its_modules():
    graph = _graph()
    for layer in LAYERS:
        assert any(m == layer or m.startswith(layer + '.') for m in graph), layer
