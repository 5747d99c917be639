"""The name-registry decorator shared by motion laws, gust profiles and spectra."""


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
