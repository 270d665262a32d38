"""The data dictionary: every catalog field of every part kind, in one place.

The schema (``catalog/schema.py``), the header matcher, the importer, the renderers, the
``--where`` grammar and the docs all read this module; none of them lists fields of its own.

Each :class:`Field` names its dimension key (see :mod:`partpick.units`), its value type, the
header wordings it is known by, and a one-line description. To add a field, add one entry
here: the table column, import, browse and JSON output follow.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

from partpick.units import normalise_text, unit_dimensions

KINDS: tuple[str, ...] = ("inductor", "capacitor", "diode", "mosfet")


@dataclass(frozen=True)
class Field:
    """One catalog field.

    ``type`` is ``"float"`` (SI value in ``unit``), ``"int"``, ``"text"``, ``"enum"`` (one
    of ``choices``, reached through ``aliases``) or ``"bool"``. ``positive`` marks a value that
    cannot be zero or negative in any real part. ``magnitude`` marks a rating that p-channel
    datasheets print with a minus sign (``-30 V``); the catalog keeps its magnitude.
    ``aliases`` maps :func:`fold_text` of each accepted spelling to its choice.
    """

    name: str
    type: str
    unit: str = ""
    description: str = ""
    synonyms: tuple[str, ...] = ()
    positive: bool = False
    choices: tuple[str, ...] = ()
    aliases: dict[str, str] = field(default_factory=dict)
    required: bool = False
    magnitude: bool = False

    def __post_init__(self) -> None:
        if self.type not in ("float", "int", "text", "enum", "bool"):
            raise ValueError(f"field {self.name}: unknown type {self.type!r}")
        if self.type == "enum" and not self.choices:
            raise ValueError(f"field {self.name}: an enum needs choices")


def _enum_aliases(choices: tuple[str, ...], extra: dict[str, str]) -> dict[str, str]:
    aliases = {fold_text(c): c for c in choices}
    aliases.update({fold_text(k): v for k, v in extra.items()})
    return aliases


def fold_text(text: str) -> str:
    """Return ``text`` in lower case with every character but letters and digits removed.

    ``"Al-Electrolytic"`` gives ``"alelectrolytic"``; µ, μ and the ohm signs are folded
    first (see :func:`partpick.units.normalise_text`) and θ becomes ``theta``.
    """
    text = normalise_text(text).lower().replace("θ", "theta")
    return re.sub(r"[^0-9a-z]+", "", text)


_GROUP_RE = re.compile(r"[\(\[\{]([^\)\]\}]*)[\)\]\}]")
_TRAILING_UNIT_RE = re.compile(r",\s*([^,]+?)\s*$")


def split_header_units(text: str) -> tuple[str, tuple[str, ...]]:
    """Split a header into its words and the unit texts it carries.

    A unit is a bracketed group (``"DCR (mΩ)"``, ``"Inductance [uH]"``) or a last
    comma-separated part (``"Isat, A"``) that reads as a unit of some dimension. Groups that
    are not units (``"Saturation Current (Isat)"``, ``"Rds(on)"``) stay in the words.
    """
    units_found: list[str] = []

    def take(match: re.Match[str]) -> str:
        inner = match.group(1).strip()
        if unit_dimensions(inner):
            units_found.append(inner)
            return " "
        return match.group(0)

    words = _GROUP_RE.sub(take, text)
    trailing = _TRAILING_UNIT_RE.search(words)
    if trailing is not None and unit_dimensions(trailing.group(1)):
        units_found.append(trailing.group(1).strip())
        words = words[: trailing.start()]
    return words.strip(), tuple(units_found)


_DIELECTRIC_CODES = (
    "c0g",
    "x5r",
    "x7r",
    "x7s",
    "x6s",
    "x8r",
    "y5v",
    "al-electrolytic",
    "al-polymer",
    "ta-mno2",
    "ta-polymer",
    "film",
)
_DIELECTRIC_ALIASES = {
    "np0": "c0g",
    "npo": "c0g",
    "cog": "c0g",
    "c0g/np0": "c0g",
    "c0g (np0)": "c0g",
    "aluminum electrolytic": "al-electrolytic",
    "aluminium electrolytic": "al-electrolytic",
    "electrolytic": "al-electrolytic",
    "al electrolytic": "al-electrolytic",
    "alu electrolytic": "al-electrolytic",
    "al-e": "al-electrolytic",
    "aluminum polymer": "al-polymer",
    "aluminium polymer": "al-polymer",
    "polymer aluminum": "al-polymer",
    "conductive polymer aluminum": "al-polymer",
    "tantalum": "ta-mno2",
    "tantalum mno2": "ta-mno2",
    "ta": "ta-mno2",
    "mno2": "ta-mno2",
    "tantalum polymer": "ta-polymer",
    "polymer tantalum": "ta-polymer",
    "film": "film",
    "polypropylene": "film",
    "polyester": "film",
    "pp film": "film",
    "pet film": "film",
    "metallized film": "film",
}
_LIFECYCLE_ALIASES = {
    "production": "active",
    "in production": "active",
    "active": "active",
    "new": "active",
    "not recommended for new designs": "nrnd",
    "nrnd": "nrnd",
    "not for new designs": "nrnd",
    "last time buy": "nrnd",
    "ltb": "nrnd",
    "eol": "obsolete",
    "end of life": "obsolete",
    "discontinued": "obsolete",
    "obsolete": "obsolete",
    "unknown": "unknown",
}
_DIODE_TYPE_ALIASES = {
    "schottky": "schottky",
    "schottky barrier": "schottky",
    "sbd": "schottky",
    "fast recovery": "fast",
    "ultrafast": "fast",
    "ultra fast": "fast",
    "fast": "fast",
    "frd": "fast",
    "standard": "standard",
    "standard recovery": "standard",
    "general purpose": "standard",
    "rectifier": "standard",
    "sic": "sic",
    "silicon carbide": "sic",
    "sic schottky": "sic",
}
_CHANNEL_ALIASES = {
    "n": "n",
    "n-channel": "n",
    "nch": "n",
    "n channel": "n",
    "p": "p",
    "p-channel": "p",
    "pch": "p",
    "p channel": "p",
}

COMMON_FIELDS: tuple[Field, ...] = (
    Field(
        "mpn",
        "text",
        description="manufacturer part number",
        required=True,
        synonyms=(
            "Part Number",
            "Mfr Part Number",
            "Manufacturer Part Number",
            "MPN",
            "Mfr. Part No.",
            "Part No",
            "PN",
            "Part",
            "Order Code",
            "Item Number",
            "Article Number",
        ),
    ),
    Field(
        "manufacturer",
        "text",
        description="manufacturer name",
        synonyms=("Manufacturer", "Mfr", "Mfg", "Maker", "Vendor", "Brand"),
    ),
    Field(
        "description",
        "text",
        description="free-text description",
        synonyms=("Description", "Desc", "Detailed Description", "Product Description"),
    ),
    Field(
        "package",
        "text",
        description="package or case code",
        synonyms=(
            "Package",
            "Case",
            "Package / Case",
            "Case Code",
            "Footprint",
            "Size Code",
            "Case/Package",
        ),
    ),
    Field(
        "unit_price",
        "float",
        "currency",
        "unit price in the catalog's currency",
        synonyms=("Price", "Unit Price", "Price Each", "Cost", "Unit Cost", "Price (1k)"),
        positive=True,
    ),
    Field(
        "stock",
        "int",
        "count",
        "units in stock",
        synonyms=(
            "Stock",
            "Quantity Available",
            "Qty Available",
            "On Hand",
            "Inventory",
            "Available",
        ),
    ),
    Field(
        "lifecycle",
        "enum",
        description="lifecycle status",
        synonyms=("Lifecycle", "Lifecycle Status", "Part Status", "Status"),
        choices=("active", "nrnd", "obsolete", "unknown"),
        aliases=_enum_aliases(("active", "nrnd", "obsolete", "unknown"), _LIFECYCLE_ALIASES),
    ),
)

_SIZE_FIELDS: tuple[Field, ...] = (
    Field(
        "length_mm",
        "float",
        "mm",
        "body length",
        positive=True,
        synonyms=("Length", "L (mm)", "Size Length", "Body Length"),
    ),
    Field(
        "width_mm",
        "float",
        "mm",
        "body width",
        positive=True,
        synonyms=("Width", "W (mm)", "Size Width", "Body Width"),
    ),
    Field(
        "height_mm",
        "float",
        "mm",
        "body height (seated)",
        positive=True,
        synonyms=("Height", "Height Seated", "Height - Seated (Max)", "Thickness", "H (mm)"),
    ),
)

_TOLERANCE = Field(
    "tolerance",
    "float",
    "fraction",
    "tolerance as a fraction (±20 % is 0.2)",
    synonyms=("Tolerance", "Tol", "Tol."),
)
_TJ_MAX = Field(
    "tj_max_degc",
    "float",
    "degC",
    "maximum junction temperature",
    synonyms=(
        "Max Junction Temperature",
        "Tj max",
        "Tjmax",
        "Operating Temperature",
        "Junction Temperature",
        "Operating Junction Temperature",
        "Tj",
    ),
)
_THETA_JA = Field(
    "theta_ja_degc_w",
    "float",
    "degC/W",
    "junction-to-ambient thermal resistance",
    positive=True,
    synonyms=(
        "Thermal Resistance Theta JA",
        "Theta JA",
        "RthJA",
        "Rth(j-a)",
        "Thermal Resistance Junction to Ambient",
        "θJA",
        "RθJA",
    ),
)

KIND_FIELDS: dict[str, tuple[Field, ...]] = {
    "inductor": (
        Field(
            "inductance_h",
            "float",
            "H",
            "nominal inductance",
            positive=True,
            synonyms=("Inductance", "L", "Nominal Inductance", "Value"),
        ),
        _TOLERANCE,
        Field(
            "isat_a",
            "float",
            "A",
            "saturation current",
            positive=True,
            synonyms=(
                "Saturation Current (Isat)",
                "Saturation Current",
                "Isat",
                "Current - Saturation",
                "Current - Saturation (Isat)",
            ),
        ),
        Field(
            "irms_a",
            "float",
            "A",
            "RMS (heating) current rating",
            positive=True,
            synonyms=(
                "RMS Current",
                "Irms",
                "Rated Current",
                "Current Rating",
                "Heating Current",
                "Current - Rated",
                "Temperature Rise Current",
            ),
        ),
        Field(
            "dcr_ohm",
            "float",
            "ohm",
            "DC resistance of the winding",
            positive=True,
            synonyms=(
                "DC Resistance",
                "DCR",
                "DC Resistance (DCR)",
                "Rdc",
                "DC Resistance (DCR) Max",
            ),
        ),
        Field(
            "srf_hz",
            "float",
            "Hz",
            "self-resonant frequency",
            positive=True,
            synonyms=("SRF", "Self Resonant Frequency", "Frequency - Self Resonant"),
        ),
        # Core-loss data for the improved generalised Steinmetz equation (Venkatachalam et
        # al., 2002). Either k, α, β with the core volume, cross-section and turns (so the
        # flux density is B = L·i/(N·Ae)), or the loss at one sinusoidal reference point with
        # α and β; see partpick/verify/core_loss.py.
        Field(
            "core_k",
            "float",
            "number",
            "Steinmetz coefficient k: core loss density W/m³ = k·f^α·B̂^β (f in Hz, B̂ peak in T)",
            positive=True,
            synonyms=("Steinmetz k", "Core Loss Coefficient k", "Steinmetz Coefficient"),
        ),
        Field(
            "core_alpha",
            "float",
            "number",
            "Steinmetz frequency exponent α of the core material",
            positive=True,
            synonyms=("Steinmetz alpha", "Core Loss alpha"),
        ),
        Field(
            "core_beta",
            "float",
            "number",
            "Steinmetz flux-density exponent β of the core material",
            positive=True,
            synonyms=("Steinmetz beta", "Core Loss beta"),
        ),
        Field(
            "core_volume_m3",
            "float",
            "m3",
            "effective core volume Ve",
            positive=True,
            synonyms=("Core Volume", "Effective Volume", "Ve"),
        ),
        Field(
            "core_area_m2",
            "float",
            "m2",
            "effective core cross-section Ae",
            positive=True,
            synonyms=("Core Area", "Effective Area", "Ae"),
        ),
        Field(
            "turns",
            "int",
            "count",
            "number of turns of the winding",
            positive=True,
            synonyms=("Turns", "Number of Turns", "N"),
        ),
        Field(
            "core_loss_ref_w",
            "float",
            "W",
            "core loss at the reference point (sinusoidal current at core_loss_ref_hz)",
            positive=True,
            synonyms=("Core Loss", "Reference Core Loss"),
        ),
        Field(
            "core_loss_ref_hz",
            "float",
            "Hz",
            "frequency of the core-loss reference point",
            positive=True,
            synonyms=("Core Loss Frequency", "Reference Frequency"),
        ),
        Field(
            "core_loss_ref_ripple_a",
            "float",
            "A",
            "peak-to-peak sinusoidal ripple current of the core-loss reference point",
            positive=True,
            synonyms=("Core Loss Ripple Current", "Reference Ripple Current"),
        ),
        *_SIZE_FIELDS,
        Field(
            "shielded",
            "bool",
            description="magnetically shielded",
            synonyms=("Shielded", "Shielding", "Shield"),
        ),
    ),
    "capacitor": (
        Field(
            "capacitance_f",
            "float",
            "F",
            "nominal capacitance",
            positive=True,
            synonyms=("Capacitance", "C", "Cap", "Nominal Capacitance", "Value"),
        ),
        _TOLERANCE,
        Field(
            "voltage_v",
            "float",
            "V",
            "rated DC voltage",
            positive=True,
            synonyms=(
                "Voltage Rating",
                "Rated Voltage",
                "Voltage - Rated",
                "Voltage",
                "Vr",
                "WVDC",
                "Working Voltage",
            ),
        ),
        Field(
            "dielectric",
            "enum",
            description="dielectric or technology code",
            synonyms=(
                "Dielectric",
                "Temperature Coefficient",
                "Technology",
                "Type",
                "Capacitor Type",
                "Material",
            ),
            choices=_DIELECTRIC_CODES,
            aliases=_enum_aliases(_DIELECTRIC_CODES, _DIELECTRIC_ALIASES),
        ),
        Field(
            "esr_ohm",
            "float",
            "ohm",
            "equivalent series resistance",
            positive=True,
            synonyms=("ESR", "Equivalent Series Resistance", "ESR (Max)", "Max ESR"),
        ),
        Field(
            "ripple_a",
            "float",
            "A",
            "rated RMS ripple current",
            positive=True,
            synonyms=(
                "Ripple Current",
                "Ripple Current @ High Frequency",
                "Irms Ripple",
                "Max Ripple Current",
                "Ripple",
            ),
        ),
        Field(
            "capacitance_at_bias_f",
            "float",
            "F",
            "capacitance at the DC bias voltage bias_v, from the datasheet's DC-bias curve",
            positive=True,
            synonyms=(
                "Capacitance at Bias",
                "Capacitance at DC Bias",
                "Capacitance @ DC Bias",
                "DC Bias Capacitance",
            ),
        ),
        Field(
            "bias_v",
            "float",
            "V",
            "DC bias voltage of capacitance_at_bias_f",
            positive=True,
            synonyms=("Bias Voltage", "DC Bias Voltage"),
        ),
        Field(
            "temp_max_degc",
            "float",
            "degC",
            "maximum operating temperature",
            synonyms=(
                "Operating Temperature",
                "Max Temperature",
                "Temperature Max",
                "Operating Temperature Range",
                "Temp Max",
            ),
        ),
        Field(
            "life_h",
            "float",
            "h",
            "rated life at maximum temperature",
            positive=True,
            synonyms=("Lifetime @ Temp.", "Life", "Lifetime", "Endurance", "Load Life"),
        ),
        *_SIZE_FIELDS,
    ),
    "diode": (
        Field(
            "diode_type",
            "enum",
            description="diode technology",
            synonyms=("Diode Type", "Type", "Technology", "Diode Technology"),
            choices=("schottky", "fast", "standard", "sic"),
            aliases=_enum_aliases(("schottky", "fast", "standard", "sic"), _DIODE_TYPE_ALIASES),
        ),
        Field(
            "vrrm_v",
            "float",
            "V",
            "repetitive peak reverse voltage",
            positive=True,
            synonyms=(
                "Reverse Voltage (Vrrm)",
                "Vrrm",
                "Reverse Voltage",
                "Voltage - DC Reverse (Vr) (Max)",
                "Peak Reverse Voltage",
                "VR",
            ),
        ),
        Field(
            "if_avg_a",
            "float",
            "A",
            "average forward current rating",
            positive=True,
            synonyms=(
                "Average Forward Current",
                "If(av)",
                "IF(AV)",
                "Forward Current",
                "Current - Average Rectified (Io)",
                "Io",
            ),
        ),
        Field(
            "ifsm_a",
            "float",
            "A",
            "non-repetitive surge current",
            positive=True,
            synonyms=("Surge Current", "Ifsm", "IFSM", "Peak Surge Current"),
        ),
        Field(
            "vf_v",
            "float",
            "V",
            "forward voltage at rated current",
            positive=True,
            synonyms=("Forward Voltage", "Vf", "VF", "Voltage - Forward (Vf) (Max) @ If"),
        ),
        Field(
            "trr_s",
            "float",
            "s",
            "reverse recovery time",
            positive=True,
            synonyms=("Reverse Recovery Time (trr)", "trr", "Reverse Recovery Time"),
        ),
        Field(
            "qrr_c",
            "float",
            "C",
            "reverse recovery charge",
            synonyms=("Reverse Recovery Charge", "Qrr", "Recovery Charge"),
        ),
        Field(
            "cj_f",
            "float",
            "F",
            "junction capacitance (energy-equivalent over the blocking voltage)",
            positive=True,
            synonyms=("Junction Capacitance", "Cj", "Diode Capacitance"),
        ),
        Field(
            "ir_a",
            "float",
            "A",
            "reverse leakage current at the rated reverse voltage, at ir_tj_degc",
            positive=True,
            synonyms=("Reverse Leakage Current", "Ir", "IR", "Current - Reverse Leakage @ Vr"),
        ),
        Field(
            "ir_tj_degc",
            "float",
            "degC",
            "junction temperature at which ir_a is given (25 °C where absent)",
            synonyms=("Leakage Test Temperature", "Ir Temperature"),
        ),
        _TJ_MAX,
        _THETA_JA,
    ),
    "mosfet": (
        Field(
            "channel",
            "enum",
            description="channel polarity",
            synonyms=("Channel", "FET Type", "Polarity", "Channel Type"),
            choices=("n", "p"),
            aliases=_enum_aliases(("n", "p"), _CHANNEL_ALIASES),
        ),
        Field(
            "vds_v",
            "float",
            "V",
            "drain-source breakdown voltage",
            positive=True,
            magnitude=True,
            synonyms=(
                "Drain-Source Voltage (Vds)",
                "Vds",
                "VDSS",
                "Drain to Source Voltage",
                "Drain to Source Voltage (Vdss)",
                "BVdss",
            ),
        ),
        Field(
            "id_a",
            "float",
            "A",
            "continuous drain current",
            positive=True,
            magnitude=True,
            synonyms=(
                "Continuous Drain Current (Id)",
                "Id",
                "Drain Current",
                "Current - Continuous Drain (Id)",
            ),
        ),
        Field(
            "rds_on_ohm",
            "float",
            "ohm",
            "on resistance at rated gate drive",
            positive=True,
            synonyms=("Rds(on)", "Rdson", "RDS(on)", "On Resistance", "Rds On (Max)", "Rds On"),
        ),
        Field(
            "vgs_th_v",
            "float",
            "V",
            "gate threshold voltage",
            positive=True,
            magnitude=True,
            synonyms=("Vgs(th)", "Gate Threshold Voltage", "Vgs(th) (Max)", "Vth"),
        ),
        Field(
            "qg_c",
            "float",
            "C",
            "total gate charge",
            positive=True,
            synonyms=(
                "Gate Charge (Qg)",
                "Qg",
                "Total Gate Charge",
                "Gate Charge (Qg) (Max) @ Vgs",
            ),
        ),
        Field(
            "qgd_c",
            "float",
            "C",
            "gate-drain (Miller) charge",
            positive=True,
            synonyms=("Qgd", "Gate-Drain Charge", "Gate Drain Charge", "Miller Charge"),
        ),
        Field(
            "coss_f",
            "float",
            "F",
            "output capacitance",
            positive=True,
            synonyms=("Coss", "Output Capacitance", "Output Capacitance (Coss)"),
        ),
        Field(
            "coss_er_f",
            "float",
            "F",
            "energy-related output capacitance Co(er) (stores the same ½·C·V² as Coss(v))",
            positive=True,
            synonyms=("Co(er)", "Coss(er)", "Energy Related Output Capacitance"),
        ),
        _TJ_MAX,
        _THETA_JA,
    ),
}


# Figures only the loss model reads (core loss, junction capacitance, leakage, Co(er)): kept
# in the catalog, CSV and JSON, left out of the terminal parts table so it fits 100 columns.
LOSS_MODEL_FIELDS: frozenset[str] = frozenset(
    {
        "core_k",
        "core_alpha",
        "core_beta",
        "core_volume_m3",
        "core_area_m2",
        "turns",
        "core_loss_ref_w",
        "core_loss_ref_hz",
        "core_loss_ref_ripple_a",
        "cj_f",
        "ir_a",
        "ir_tj_degc",
        "coss_er_f",
    }
)


def fields_of(kind: str) -> tuple[Field, ...]:
    """Return every field of ``kind``: the common ones, then the kind's own."""
    if kind not in KIND_FIELDS:
        raise KeyError(kind)
    return COMMON_FIELDS + KIND_FIELDS[kind]


def field_of(kind: str, name: str) -> Field:
    """Return the field ``name`` of ``kind``; raises KeyError if there is none."""
    for f in fields_of(kind):
        if f.name == name:
            return f
    raise KeyError(name)


PROVENANCE_COLUMNS: tuple[str, ...] = ("source_file", "source_sha256", "imported_at", "source_line")
