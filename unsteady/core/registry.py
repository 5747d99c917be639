"""Small shared helpers for the name registries and optional modules."""


def registrar(table, kind):
    """A class decorator factory that files classes in ``table`` by the scenario name.

    ``registrar(LAWS, "motion law")("ramp")`` returns a decorator that sets
    ``cls.name = "ramp"`` and adds the class, refusing a second class of the
    same name.
    """
    def register(name):
        def add(cls):
            if name in table:
                raise ValueError(f"a {kind} named '{name}' is already registered")
            cls.name = name
            table[name] = cls
            return cls
        return add
    return register


def import_optional(package, modules):
    """Import ``package.<module>`` for each module that exists (importing registers it).

    A module that is absent is skipped; an import error inside a module that
    exists is raised.
    """
    for mod in modules:
        try:
            __import__(f"{package}.{mod}")
        except ModuleNotFoundError as exc:
            if exc.name != f"{package}.{mod}":
                raise
