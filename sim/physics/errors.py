"""Errors raised by the physics models."""


class ModelRangeError(ValueError):
    """An input lies outside the range in which a model (or its source correlation) is valid.

    The message names the quantity, the offending value and the allowed range.
    """

    def __init__(self, quantity: str, value: object, allowed: str, model: str = "") -> None:
        self.quantity = quantity
        self.value = value
        self.allowed = allowed
        self.model = model
        where = f" ({model})" if model else ""
        super().__init__(f"{quantity} = {value!r} is outside the valid range{where}: {allowed}")
