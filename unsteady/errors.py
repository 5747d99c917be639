"""Error types shared by the input checks of every module."""


class InputError(ValueError):
    def __init__(self, key: str, message: str):
        super().__init__(f"{key}: {message}"); self.key = key; self.message = message
