"""Hazard rules, one module per concern; each is a pure function (setup, assessment, thresholds) -> findings."""
from hazards.rules.electrical import electrical
from hazards.rules.implants import implants
from hazards.rules.objects import objects
from hazards.rules.pinch import pinch
from hazards.rules.projectiles import projectiles
from hazards.rules.shipping import shipping
from hazards.rules.small_magnets import small_magnets
from hazards.rules.temperature import temperature

#: (concern, rule) in the order the findings are gathered.
RULES = [("implants", implants), ("objects", objects), ("projectiles", projectiles), ("pinch", pinch),
         ("small_magnets", small_magnets), ("shipping", shipping), ("electrical", electrical),
         ("temperature", temperature)]

__all__ = ["RULES", "implants", "objects", "projectiles", "pinch", "small_magnets", "shipping", "electrical",
           "temperature"]
