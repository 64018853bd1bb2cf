"""The setup file's schema, declared once: it validates setups and generates the JSON Schema.

All quantities are SI floats after validation (m, T, kg, s, A, V, ohm, S/m, rad, rad/s, degC).
All directions (`magnetization`, `axis`, `normal`) are unit vectors in the setup frame:
x along the bench, y across it, z up from the bench top.
"""
from __future__ import annotations

import datetime
from typing import Annotated, Literal, Optional, Union

from typing import Any

from pydantic import BaseModel, ConfigDict, Field, PrivateAttr

from planner.setup.types import Direction, Pair, Quantity, Vector

Length = Quantity("length", positive=True)
Distance = Quantity("length")
Position = Vector("length")
Identifier = Annotated[str, Field(min_length=1, max_length=80, pattern=r"^[A-Za-z0-9][A-Za-z0-9_.\-]*$",
                                   description="a short name of letters, digits, `-`, `_` or `.`, unique in the file")]
Text = Annotated[str, Field(max_length=2000)]


class Part(BaseModel):
    """Base of every part of the setup file: unknown keys are errors, values are frozen."""

    model_config = ConfigDict(extra="forbid", frozen=True, populate_by_name=True)


# --- audience -------------------------------------------------------------------------------

class Audience(Part):
    """Who is present during the work."""

    groups: list[Literal["staff", "students", "public"]] = Field(
        default_factory=lambda: ["staff"], description="who is present: staff, students, public")
    youngest_age: Optional[Annotated[int, Field(ge=0, le=120)]] = Field(
        None, description="age in years of the youngest person present (children under 14 trigger the small-magnet rules)")
    implant_wearers: Literal["screened_out", "may_be_present"] = Field(
        "may_be_present", description="whether people with active implants are screened out before entry")
    size: Optional[Annotated[int, Field(ge=1)]] = Field(None, description="number of people expected")


# --- magnets --------------------------------------------------------------------------------

class RotationStep(Part):
    """Turn a block by `angle` about a setup-frame axis through its centre (right-hand rule)."""

    about: Direction
    angle: Quantity("angle")


class MagnetCommon(Part):
    id: Identifier
    at: Position = Field(description="centre of the magnet [x, y, z]")
    magnetization: Direction = Field(description="direction of magnetization (north pole side) in the setup frame")
    grade: Optional[str] = Field(None, description="material grade, e.g. N42, N42SH, SmCo5, ferrite, AlNiCo5 (see `benchplan grades`)")
    remanence: Optional[Quantity("flux density", positive=True)] = Field(
        None, description="remanence Br if no grade is given, or to override the grade's value")
    count: Annotated[int, Field(ge=1, le=100000)] = Field(
        1, description="identical pieces this entry stands for (handling, counting out and in, shipping); the field model places one at `at`")
    mass: Optional[Quantity("mass", positive=True)] = Field(None, description="mass of one piece; computed from the grade's density if omitted")
    label: Optional[Text] = None


class Cylinder(MagnetCommon):
    shape: Literal["cylinder"]
    diameter: Length
    height: Length
    axis: Optional[Direction] = Field(None, description="symmetry axis if it differs from the magnetization (diametral magnets)")


class Ring(MagnetCommon):
    shape: Literal["ring"]
    diameter: Length
    inner_diameter: Length
    height: Length
    axis: Optional[Direction] = Field(None, description="symmetry axis if it differs from the magnetization")


class Block(MagnetCommon):
    shape: Literal["block"]
    size: Vector("length") = Field(description="edge lengths [x, y, z] along the setup axes before any rotation")
    rotation: list[RotationStep] = Field(default_factory=list, description="turns applied in order to the block's edges (the magnetization is given in the setup frame)")


class Sphere(MagnetCommon):
    shape: Literal["sphere"]
    diameter: Length


Magnet = Annotated[Union[Cylinder, Ring, Block, Sphere], Field(discriminator="shape")]


# --- steel ----------------------------------------------------------------------------------

class SteelSurface(Part):
    """A large flat steel part (bench frame, plate, cabinet door) that magnets are pulled to."""

    id: Identifier
    at: Position = Field(description="a point on the steel's face")
    normal: Direction = Field(description="outward normal of the face, pointing from the steel toward the magnets")
    thickness: Length
    size: Optional[Pair("length")] = Field(
        None, description="[length, width] of the face, centred on `at` and square to the setup axes; omitted: large")
    steel: str = Field("low-carbon-steel", description="steel name (see `benchplan grades`)")
    label: Optional[Text] = None


class SteelItemCommon(Part):
    id: Identifier
    at: Position = Field(description="where the item lies")
    steel: str = Field("low-carbon-steel", description="steel name (see `benchplan grades`)")
    mass: Optional[Quantity("mass", positive=True)] = None
    label: Optional[Text] = None


class SteelRod(SteelItemCommon):
    shape: Literal["rod"] = Field(description="screwdrivers, spanners, scissors, pens with steel parts")
    length: Length
    diameter: Length


class SteelBall(SteelItemCommon):
    shape: Literal["sphere"] = Field(description="nuts, balls, small round parts")
    diameter: Length


class SteelPlate(SteelItemCommon):
    shape: Literal["plate"] = Field(description="rulers, brackets, small sheets")
    length: Length
    width: Length
    thickness: Length


SteelItem = Annotated[Union[SteelRod, SteelBall, SteelPlate], Field(discriminator="shape")]


# --- conductors -----------------------------------------------------------------------------

class ConductorCommon(Part):
    id: Identifier
    material: Optional[str] = Field(None, description="conductor name (see `benchplan grades`), e.g. copper, aluminium-6061-T6")
    conductivity: Optional[Quantity("conductivity", positive=True)] = Field(None, description="electrical conductivity, if no material is given")
    at: Position = Field(description="centre of the part")
    label: Optional[Text] = None


class Tube(ConductorCommon):
    kind: Literal["tube"]
    inner_diameter: Length
    outer_diameter: Length
    length: Length
    axis: Direction = Field((0.0, 0.0, 1.0), description="tube axis (default vertical)")


class Sheet(ConductorCommon):
    kind: Literal["sheet"]
    thickness: Length
    size: Pair("length") = Field(description="[length, width] of the sheet")


Conductor = Annotated[Union[Tube, Sheet], Field(discriminator="kind")]


# --- coils ----------------------------------------------------------------------------------

class MeterInput(Part):
    """A meter: a galvanometer, an ammeter or a voltmeter."""

    kind: Literal["meter"]
    full_scale_current: Optional[Quantity("current", positive=True)] = Field(None, description="e.g. `100 uA` for a centre-zero galvanometer")
    full_scale_voltage: Optional[Quantity("voltage", positive=True)] = Field(None, description="e.g. `2 V` for a voltmeter")
    resistance: Quantity("resistance", positive=True) = Field(description="internal resistance of the meter")


class Load(Part):
    """A resistive load: a lamp, a resistor, an LED string with its series resistor."""

    kind: Literal["load"]
    resistance: Quantity("resistance", positive=True)
    rated_voltage: Optional[Quantity("voltage", positive=True)] = None
    rated_power: Optional[Quantity("power", positive=True)] = None
    label: Optional[Text] = None


class Supply(Part):
    """A supply driving the coil: DC when no frequency is given."""

    kind: Literal["supply"]
    current: Quantity("current", positive=True) = Field(description="DC current, or rms current for AC")
    frequency: Optional[Quantity("frequency", positive=True)] = None
    voltage: Optional[Quantity("voltage", positive=True)] = Field(None, description="supply voltage (rms for AC)")
    switch_off_time: Optional[Quantity("time", positive=True)] = Field(None, description="how fast the current is interrupted")
    mains: bool = Field(False, description="true if powered from the mains (needs the site's electrical rules)")


Connection = Annotated[Union[MeterInput, Load, Supply], Field(discriminator="kind")]


class Coil(Part):
    id: Identifier
    turns: Annotated[int, Field(ge=1, le=10_000_000)]
    inner_diameter: Length
    outer_diameter: Optional[Length] = Field(None, description="outside of the winding; from wire and layers if omitted")
    length: Length = Field(description="winding length along the axis")
    layers: Optional[Annotated[int, Field(ge=1, le=100000)]] = None
    wire_diameter: Optional[Length] = Field(None, description="bare copper diameter, for resistance and winding build")
    resistance: Optional[Quantity("resistance", positive=True)] = Field(None, description="measured DC resistance (overrides the wire estimate)")
    at: Position = Field(description="centre of the winding")
    axis: Direction = Field((0.0, 0.0, 1.0))
    connected_to: Optional[Connection] = None
    label: Optional[Text] = None


# --- activities -----------------------------------------------------------------------------

class ActivityCommon(Part):
    id: Identifier
    temperature: Optional[Quantity("temperature")] = Field(None, description="highest temperature the magnets reach during it")
    label: Optional[Text] = None


class PassThroughCoil(ActivityCommon):
    kind: Literal["pass_through_coil"]
    magnet: Identifier
    coil: Identifier
    speed: Optional[Quantity("speed", positive=True)] = Field(None, description="constant speed of the magnet along the coil axis")
    drop_height: Optional[Length] = Field(None, description="height above the coil centre from which the magnet is dropped")
    offset: Distance = Field(0.0, description="sideways distance of the path from the coil axis (0 = through the bore)")


class DropThroughTube(ActivityCommon):
    kind: Literal["drop_through_tube"]
    magnet: Identifier
    tube: Identifier


class SwingOverSheet(ActivityCommon):
    kind: Literal["swing_over_sheet"]
    magnet: Identifier
    sheet: Identifier
    height: Length = Field(description="gap between the magnet's lowest face and the sheet at the bottom of the swing")
    speed: Quantity("speed", positive=True) = Field(description="largest speed over the sheet")
    bob_mass: Optional[Quantity("mass", positive=True)] = Field(None, description="pendulum bob mass including the magnet")


class CrankGenerator(ActivityCommon):
    kind: Literal["crank_generator"]
    coil: Identifier
    field: Quantity("flux density", positive=True) = Field(description="flux density through the turning coil")
    speed: Quantity("rotation speed", positive=True) = Field(description="crank speed, e.g. `120 rpm`")
    target_voltage: Optional[Quantity("voltage", positive=True)] = None


class BringTogether(ActivityCommon):
    kind: Literal["bring_together"]
    magnet: Identifier
    other: Identifier = Field(description="id of a magnet, steel surface or loose steel item")
    by: Literal["hand", "sliding_on_bench"] = "hand"


class ShipPackage(ActivityCommon):
    kind: Literal["ship_package"]
    magnets: list[Identifier] = Field(min_length=1)
    package_size: Vector("length")
    shielded: bool = Field(False, description="true if steel keepers or a shield are fitted")


class CoupleCoils(ActivityCommon):
    kind: Literal["couple_coils"]
    primary: Identifier
    secondary: Identifier


class SwitchOff(ActivityCommon):
    kind: Literal["switch_off"]
    coil: Identifier


Activity = Annotated[
    Union[PassThroughCoil, DropThroughTube, SwingOverSheet, CrankGenerator, BringTogether, ShipPackage,
          CoupleCoils, SwitchOff],
    Field(discriminator="kind"),
]


# --- zones ----------------------------------------------------------------------------------

class Zone(Part):
    """A box where people or equipment are: opposite corners `from` and `to`."""

    id: Identifier
    kind: Literal["seating", "standing", "walkway", "door", "desk", "equipment", "storage", "next_room", "stage"]
    corner_from: Position = Field(alias="from")
    corner_to: Position = Field(alias="to")
    people: Optional[bool] = Field(None, description="people are in it (default: yes for seating, standing, walkway, door, desk, next_room, stage)")
    contains: list[Literal["cards", "watches", "instruments", "storage_media", "computers", "phones"]] = Field(default_factory=list)
    instrument_limit: Optional[Quantity("flux density", positive=True)] = Field(
        None, description="the instruments' own stated limit, which wins over the general 0.1 mT guidance")
    label: Optional[Text] = None


# --- site rules -----------------------------------------------------------------------------

class ThresholdOverride(Part):
    value: str = Field(description="the site's value with its unit, e.g. `0.3 mT`")
    reason: Optional[Text] = Field(None, description="required when the site's value is less strict than the default")


class CompetentPerson(Part):
    name: Text
    role: Text


class SiteRules(Part):
    name: Optional[Text] = None
    thresholds: dict[str, ThresholdOverride] = Field(default_factory=dict, description="overrides by threshold id (see `benchplan grades --thresholds`)")
    protective_equipment: list[Text] = Field(default_factory=list)
    competent_persons: list[CompetentPerson] = Field(default_factory=list)
    review_interval: Optional[Quantity("duration", positive=True)] = Field(None, description="how long a sign-off stays valid, e.g. `12 months`")
    hand_force: Optional[Quantity("force", positive=True)] = Field(None, description="force a person can control when holding a magnet")
    bench_friction: Optional[Annotated[float, Field(gt=0, le=2)]] = Field(None, description="static friction coefficient of magnets on the bench")
    finger_gap: Optional[Length] = Field(None, description="finger thickness used for pinch figures")
    electrical_limits: Optional[Literal["IEC 61010-1 ed. 3", "IEC 61010-1 ed. 2"]] = None
    requirements: list[Text] = Field(default_factory=list, description="the site's own requirements, printed in the checklist")


# --- the whole file -------------------------------------------------------------------------

class Setup(Part):
    """One bench, demonstration or store: everything benchplan computes with."""

    title: Annotated[str, Field(min_length=1, max_length=200)]
    site: Optional[Text] = None
    date: Optional[datetime.date] = None
    audience: Audience = Field(default_factory=Audience)
    magnets: list[Magnet]
    steel_surfaces: list[SteelSurface] = Field(default_factory=list)
    loose_steel: list[SteelItem] = Field(default_factory=list)
    conductors: list[Conductor] = Field(default_factory=list)
    coils: list[Coil] = Field(default_factory=list)
    activities: list[Activity] = Field(default_factory=list)
    zones: list[Zone] = Field(default_factory=list)
    site_rules: Optional[Union[SiteRules, Annotated[str, Field(min_length=1)]]] = Field(
        None, description="the site's own rules inline, or the path of a YAML file holding them")
    notes: Optional[Text] = None

    # Line numbers of the file it was read from (not part of the data).
    _lines: Any = PrivateAttr(None)
